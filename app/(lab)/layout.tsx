import Link from "next/link";
import { redirect } from "next/navigation";
import { currentIdentity, labsOfUser, membershipOf } from "@/lib/auth/context";
import { pageRule } from "@/lib/auth/page-routes";
import { can, ROLE_LABELS, type Role } from "@/lib/auth/permissions";
import { LabChooser } from "@/components/shell/lab-chooser";
import { LabSwitcher, SignOutButton } from "@/components/shell/lab-switcher";
import { NavLinks } from "@/components/shell/nav-links";
import { Providers } from "@/components/shell/providers";
import { Wordmark } from "@/components/ui/logo";

export const dynamic = "force-dynamic";

export default async function LabLayout({ children }: { children: React.ReactNode }) {
  const identity = await currentIdentity();
  if (!identity) redirect("/sign-in");
  const labs = await labsOfUser(identity.userId);
  const active = identity.labId ? await membershipOf(identity.userId, identity.labId) : null;
  if (!active) {
    return (
      <main className="max-w-xl mx-auto p-8 space-y-4">
        <Wordmark />
        {labs.length > 0 ? (
          <>
            <p role="alert">This session points at a lab you are no longer a member of. Choose one of your labs:</p>
            <Providers><LabChooser labs={labs} /> <SignOutButton /></Providers>
          </>
        ) : (
          <>
            <p role="alert">You are not a member of any lab. Ask a lab lead for an invitation, or <a className="link" href="/sign-up">create a lab</a>.</p>
            <Providers><SignOutButton /></Providers>
          </>
        )}
      </main>
    );
  }
  const items = [
    { href: "/", label: "Home" },
    { href: "/trials", label: "Trials" },
    { href: "/due", label: "Due" },
    { href: "/chambers", label: "Chambers" },
    { href: "/collection", label: "Collection" },
    { href: "/specimens", label: "Specimens" },
    { href: "/treatments", label: "Treatments" },
    { href: "/analysis", label: "Analysis" },
    { href: "/storage-rules", label: "Storage rules" },
    { href: "/audit", label: "Audit trail" },
    { href: "/settings", label: "Lab settings" },
    ...(process.env.DEMO_MODE === "1" && can(active.role as Role, pageRule("/mailbox").permission) ? [{ href: "/mailbox", label: "Demo mailbox" }] : []),
  ];
  return (
    <Providers>
      <div className="min-h-screen">
        <header className="border-b border-[var(--line)] bg-[var(--panel)]">
          <div className="max-w-7xl mx-auto px-4 py-2 flex flex-wrap items-center gap-4">
            <Link href="/" aria-label="Rustline home"><Wordmark /></Link>
            <LabSwitcher labs={labs} activeLabId={active.labId} />
            <span className="text-xs rounded-full border border-[var(--line)] px-2 py-0.5" title={ROLE_LABELS[active.role as Role].summary}>
              {ROLE_LABELS[active.role as Role].name}
            </span>
            <div className="ml-auto"><SignOutButton /></div>
          </div>
          <nav aria-label="Main" className="max-w-7xl mx-auto px-4 pb-2"><NavLinks items={items} /></nav>
        </header>
        <main className="max-w-7xl mx-auto px-4 py-6">{children}</main>
      </div>
    </Providers>
  );
}
