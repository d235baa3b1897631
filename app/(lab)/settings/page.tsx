import { eq } from "drizzle-orm";
import { db } from "@/db/client";
import { users } from "@/db/schema";
import { listInvitations } from "@/db/queries/accounts";
import { listMembers } from "@/db/queries/memberships";
import { labPage } from "@/lib/auth/page";
import { can, ROLE_LABELS } from "@/lib/auth/permissions";
import { formatDateTime } from "@/lib/format";
import { CollectionDigestForm, InviteForm, PasswordForm, ReminderForm, RoleForm } from "@/components/settings/settings-forms";

export const metadata = { title: "Lab settings" };

export default async function SettingsPage() {
  const ctx = await labPage("/settings");
  const manage = can(ctx.role, "members.manage");
  const [members, invites, me] = await Promise.all([
    listMembers({ labId: ctx.labId }),
    manage ? listInvitations({ labId: ctx.labId }) : Promise.resolve([]),
    db.select({ optOut: users.remindersOptOut, digest: users.collectionDigest }).from(users).where(eq(users.id, ctx.userId)),
  ]);
  const now = new Date();
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-semibold">Lab settings</h1>
      <section className="panel p-4 space-y-3" aria-labelledby="members-h">
        <h2 id="members-h" className="font-semibold">Members</h2>
        <table className="data">
          <thead><tr><th>Name</th><th>E-mail</th><th>Role</th><th>Member since</th></tr></thead>
          <tbody>
            {members.map((m) => (
              <tr key={m.userId}>
                <td>{m.name}</td>
                <td>{m.email}</td>
                <td>{manage && m.userId !== ctx.userId ? <RoleForm userId={m.userId} role={m.role} /> : ROLE_LABELS[m.role].name}</td>
                <td>{formatDateTime(m.since)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      {manage && (
        <div className="grid gap-6 md:grid-cols-2">
          <section className="panel p-4 space-y-3" aria-labelledby="invite-h">
            <h2 id="invite-h" className="font-semibold">Invite someone</h2>
            <p className="text-sm muted">They get an e-mail with a link that works once, for seven days, and fixes the role you choose.</p>
            <InviteForm />
          </section>
          <section className="panel p-4 space-y-3" aria-labelledby="invites-h">
            <h2 id="invites-h" className="font-semibold">Invitations</h2>
            {invites.length === 0 ? <p className="text-sm muted">No invitations yet.</p> : (
              <table className="data">
                <thead><tr><th>E-mail</th><th>Role</th><th>State</th></tr></thead>
                <tbody>
                  {invites.map((i) => (
                    <tr key={i.id}>
                      <td>{i.email}</td>
                      <td>{ROLE_LABELS[i.role].name}</td>
                      <td>{i.acceptedAt ? "accepted" : i.revokedAt ? "withdrawn" : i.expiresAt < now ? "expired" : `open until ${formatDateTime(i.expiresAt)}`}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            )}
          </section>
        </div>
      )}
      <div className="grid gap-6 md:grid-cols-2">
        <section className="panel p-4 space-y-3" aria-labelledby="pw-h">
          <h2 id="pw-h" className="font-semibold">Your password</h2>
          <PasswordForm />
        </section>
        <section className="panel p-4 space-y-3" aria-labelledby="rem-h">
          <h2 id="rem-h" className="font-semibold">Reminder e-mails</h2>
          <ReminderForm optOut={me[0]?.optOut ?? false} />
        </section>
        <section className="panel p-4 space-y-3" aria-labelledby="coll-h">
          <h2 id="coll-h" className="font-semibold">Collection alerts</h2>
          <CollectionDigestForm digest={me[0]?.digest ?? false} />
        </section>
      </div>
    </div>
  );
}
