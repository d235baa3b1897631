"use client";
// Hidden inputs that carry the table's current sort and page size (from the URL, which the table may
// change on the client) into a plain GET filter form beside it.
import { useSearchParams } from "next/navigation";

export function UrlHiddenInputs({ defaults }: { defaults: Record<string, string | number> }) {
  const params = useSearchParams();
  return Object.entries(defaults).map(([name, value]) => <input key={name} type="hidden" name={name} value={params.get(name) ?? String(value)} />);
}
