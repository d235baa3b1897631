import Link from "next/link";

export function EmptyState({ text, action }: { text: string; action?: { href: string; label: string } }) {
  return (
    <div className="rounded-md border border-dashed border-[var(--line)] p-4 text-sm">
      <p className="muted">{text}</p>
      {action && <Link href={action.href} className="link mt-2 inline-block">{action.label}</Link>}
    </div>
  );
}
