"use client";
import { useActionState } from "react";
import { changeMemberRole, changeOwnPassword, inviteMember, setReminderPreference, setCollectionDigest } from "@/app/_actions/settings";
import { Field, FormMessage, SelectField, SubmitButton } from "@/components/ui/form";
import { ROLE_LABELS, ROLES } from "@/lib/auth/permissions";

const roleOptions = ROLES.map((r) => ({ value: r, label: `${ROLE_LABELS[r].name} — ${ROLE_LABELS[r].summary}` }));

export function InviteForm() {
  const [state, action] = useActionState(inviteMember, undefined);
  return (
    <form action={action} className="space-y-3" noValidate>
      <Field name="email" label="E-mail" type="email" state={state} />
      <SelectField name="role" label="Role" options={roleOptions} state={state} defaultValue="technician" />
      <FormMessage state={state} />
      <SubmitButton pendingText="Sending…">Send invitation</SubmitButton>
    </form>
  );
}

export function RoleForm({ userId, role }: { userId: string; role: string }) {
  const [state, action] = useActionState(changeMemberRole, undefined);
  return (
    <form action={action} className="flex items-center gap-2">
      <input type="hidden" name="userId" value={userId} />
      <label className="sr-only" htmlFor={`role-${userId}`}>Role</label>
      <select id={`role-${userId}`} name="role" defaultValue={role} className="field py-1 w-36">
        {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r].name}</option>)}
      </select>
      <SubmitButton pendingText="…">Set</SubmitButton>
      {state?.message && <span role={state.ok ? "status" : "alert"} className={`text-xs ${state.ok ? "" : "text-rust-600"}`}>{state.message}</span>}
    </form>
  );
}

export function PasswordForm() {
  const [state, action] = useActionState(changeOwnPassword, undefined);
  return (
    <form action={action} className="space-y-3" noValidate>
      <Field name="currentPassword" label="Current password" type="password" state={state} autoComplete="current-password" />
      <Field name="newPassword" label="New password" type="password" state={state} autoComplete="new-password" hint="At least 10 characters, mixing letters with digits or symbols." />
      <FormMessage state={state} />
      <SubmitButton>Change password</SubmitButton>
    </form>
  );
}

export function ReminderForm({ optOut }: { optOut: boolean }) {
  const [state, action] = useActionState(setReminderPreference, undefined);
  return (
    <form action={action} className="space-y-2">
      <input type="hidden" name="optOut" value={optOut ? "0" : "1"} />
      <p className="text-sm">{optOut ? "You have turned off inspection reminder e-mails." : "You get an e-mail the day before an inspection you are assigned to, and when it is overdue."}</p>
      <SubmitButton>{optOut ? "Turn reminders on" : "Turn reminders off"}</SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}

export function CollectionDigestForm({ digest }: { digest: boolean }) {
  const [state, action] = useActionState(setCollectionDigest, undefined);
  return (
    <form action={action} className="space-y-2">
      <input type="hidden" name="digest" value={digest ? "0" : "1"} />
      <p className="text-sm">
        {digest
          ? "Alerts for the storage locations you keep come as one e-mail a day (07:00 UTC) listing the new exceedances."
          : "You get an e-mail for each exceedance of a storage location you keep, once it has lasted the location's alert delay (6 h unless set)."}
      </p>
      <SubmitButton>{digest ? "One e-mail per exceedance" : "One e-mail a day instead"}</SubmitButton>
      <FormMessage state={state} />
    </form>
  );
}
