import { notFound } from "next/navigation";
import { listMailRecipients } from "@/db/queries/memberships";
import { labPage } from "@/lib/auth/page";
import { formatDateTime } from "@/lib/format";
import { listMessages } from "@/lib/mail-store";
import { EmptyState } from "@/components/ui/empty-state";

export const metadata = { title: "Demo mailbox" };

// Plain text with its links made clickable (invitation and reminder links).
function Linked({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s<>"]+)/g);
  return <>{parts.map((p, i) => (/^https?:\/\//.test(p) ? <a key={i} className="link break-all" href={p}>{p}</a> : <span key={i}>{p}</span>))}</>;
}

export default async function MailboxPage({ searchParams }: { searchParams: Promise<{ to?: string }> }) {
  if (process.env.DEMO_MODE !== "1") notFound();
  // Leads only (lib/auth/page-routes), and only mail this lab sent to its members or to people it invited.
  const ctx = await labPage("/mailbox");
  const { to } = await searchParams;
  const recipients = await listMailRecipients({ labId: ctx.labId });
  const messages = await listMessages(process.env.MAIL_DIR ?? ".data/mail", { to: to || undefined, labId: ctx.labId, recipients, limit: 100 });
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold">Demo mailbox</h1>
      <p className="text-sm muted max-w-3xl">
        In demo mode Rustline sends mail to a local SMTP server that keeps every message instead of delivering it. This page
        shows the lab&apos;s leads the mail {ctx.labName} sent to its members and to the people it invited: open an invitation or
        reminder link from here. Outside demo mode (a real mail service, DEMO_MODE=0) this page is off.
      </p>
      <form method="get" className="flex gap-2 items-end">
        <label className="text-sm">Recipient<input name="to" defaultValue={to ?? ""} className="field" placeholder="name@example.org" /></label>
        <button className="btn-quiet">Filter</button>
      </form>
      {messages.length === 0 ? <EmptyState text="No mail yet. Invitations and inspection reminders will appear here." /> : (
        <ul className="space-y-3">
          {messages.map((m) => (
            <li key={m.id} className="panel p-4">
              <details>
                <summary className="cursor-pointer">
                  <span className="font-medium">{m.subject || "(no subject)"}</span>
                  <span className="text-sm muted"> — to {m.to.join(", ")} · {formatDateTime(m.receivedAt)}</span>
                </summary>
                <pre className="mt-3 whitespace-pre-wrap text-sm font-sans"><Linked text={m.text} /></pre>
              </details>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
