"use client";
import Link from "next/link";
import { usePathname } from "next/navigation";
import { useNavSection } from "./nav-section";

export function NavLinks({ items }: { items: { href: string; label: string }[] }) {
  const path = usePathname();
  const section = useNavSection();
  return (
    <ul className="flex flex-wrap gap-1">
      {items.map((i) => {
        const active = section ? i.href === section : i.href === "/" ? path === "/" : path.startsWith(i.href);
        return (
          <li key={i.href}>
            <Link href={i.href} aria-current={active ? "page" : undefined}
              className={`block rounded-md px-3 py-1.5 text-sm ${active ? "bg-verdigris-600 text-white" : "hover:bg-iron-200/60"}`}>
              {i.label}
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
