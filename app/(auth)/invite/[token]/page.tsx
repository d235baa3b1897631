import { findOpenInvitation } from "@/db/queries/accounts";
import { AcceptInviteForm } from "@/components/auth/accept-invite-form";
import { ROLE_LABELS } from "@/lib/auth/permissions";

export const metadata = { title: "Invitation" };

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const found = await findOpenInvitation({ token });
  if (found.state !== "open") {
    const text = {
      unknown: "This invitation link is not valid. Check that the whole link was copied.",
      used: "This invitation has already been used. Sign in with the account that accepted it.",
      revoked: "This invitation was withdrawn by the lab.",
      expired: "This invitation has expired. Ask the lab lead to send a new one.",
    }[found.state];
    return (
      <div className="panel p-6 space-y-3">
        <h1 className="text-xl font-semibold">Invitation unavailable</h1>
        <p role="alert">{text}</p>
        <a className="link" href="/sign-in">Go to sign-in</a>
      </div>
    );
  }
  const role = ROLE_LABELS[found.row.role];
  return (
    <div className="panel p-6 space-y-4">
      <h1 className="text-xl font-semibold">Join {found.row.labName}</h1>
      <p className="text-sm">You are invited as <strong>{role.name}</strong> ({role.summary.toLowerCase()}) with the address <strong>{found.row.email}</strong>.</p>
      <AcceptInviteForm token={token} hasAccount={found.hasAccount} />
    </div>
  );
}
