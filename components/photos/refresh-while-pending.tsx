"use client";
import { useRouter } from "next/navigation";
import { useEffect } from "react";

/** Re-read the page every few seconds while previews are being made (for up to two minutes). */
export function RefreshWhilePending({ pending }: { pending: number }) {
  const router = useRouter();
  useEffect(() => {
    if (pending === 0) return;
    const started = Date.now();
    const timer = setInterval(() => {
      if (Date.now() - started > 120_000) clearInterval(timer);
      else router.refresh();
    }, 3000);
    return () => clearInterval(timer);
  }, [pending, router]);
  if (pending === 0) return null;
  return <p className="text-xs muted" role="status">{pending} preview{pending === 1 ? " is" : "s are"} being made; this page updates by itself.</p>;
}
