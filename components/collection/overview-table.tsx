"use client";
// The collection overview's table. A client component fed with the rows as short strings: the page
// sends the rows once instead of a server-rendered tree of every cell (200 locations).
import Link from "next/link";
import type { TraceGeometry } from "@/lib/collection/rh-trace";
import { RhTrace } from "./rh-trace";

export type OverviewRow = {
  id: string; path: string; needs: string; keepBelow: string; inRule: [string, string, string]; lastReading: string;
  trace: TraceGeometry | null; objects: number; keeper: string;
};

export function OverviewTable({ rows }: { rows: readonly OverviewRow[] }) {
  return (
    <table className="data" aria-label="Storage locations by need">
      <thead>
        <tr>
          <th scope="col">Location</th><th scope="col">Needs</th><th scope="col" className="text-right! whitespace-nowrap">keep below</th>
          <th scope="col" className="text-right! whitespace-nowrap">in rule 7 d</th><th scope="col" className="text-right! whitespace-nowrap">30 d</th><th scope="col" className="text-right! whitespace-nowrap">365 d</th>
          <th scope="col">last reading</th><th scope="col">last 30 days</th><th scope="col" className="text-right! whitespace-nowrap">objects</th><th scope="col">keeper</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => (
          <tr key={r.id}>
            <th scope="row" className="text-left font-medium!"><Link className="link" href={`/chambers/${r.id}`} prefetch={false}>{r.path}</Link></th>
            <td>{r.needs}</td>
            <td className="text-right tabular-nums whitespace-nowrap">{r.keepBelow}</td>
            <td className="text-right tabular-nums whitespace-nowrap">{r.inRule[0]}</td>
            <td className="text-right tabular-nums whitespace-nowrap">{r.inRule[1]}</td>
            <td className="text-right tabular-nums whitespace-nowrap">{r.inRule[2]}</td>
            <td className="tabular-nums">{r.lastReading}</td>
            <td><RhTrace trace={r.trace} /></td>
            <td className="text-right tabular-nums whitespace-nowrap">{r.objects}</td>
            <td>{r.keeper}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
