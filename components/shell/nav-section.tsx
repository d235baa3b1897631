"use client";
// Which main-menu entry a page belongs to when its address alone does not say: a storage location's
// page lives at /chambers/<id> (a chamber is a location) but belongs to Collection. The page renders
// <NavSection href="/collection" />; the menu (nav-links.tsx) marks that entry while the page is shown.
// Until the page's script runs, the menu goes by the address.
import { useEffect, useSyncExternalStore } from "react";

let current: string | null = null;
const listeners = new Set<() => void>();
const set = (href: string | null) => {
  current = href;
  for (const l of listeners) l();
};

export function useNavSection(): string | null {
  return useSyncExternalStore(
    (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    },
    () => current,
    () => null,
  );
}

export function NavSection({ href }: { href: string }) {
  useEffect(() => {
    set(href);
    return () => set(null);
  }, [href]);
  return null;
}
