// The trial report's history table: each specimen's origin and what its history said before the
// trial, with its first weighing and its mass change over the trial (rules in lib/specimens/history.ts).
import type { TrialHistoryRow } from "@/db/queries/specimen-history";
import { CHLORIDE_STATE_LABELS } from "@/lib/specimens/history";

const signed = (x: number, digits: number) => `${x > 0 ? "+" : x < 0 ? "−" : "±"}${Math.abs(x).toFixed(digits)}`;

export const HISTORY_METHOD =
  "Chloride state, akaganeite and treatments from entries dated before the start day; mass change from the last weighing on or before the start day to the last one up to the trial's end (or today).";

export function HistoryTable({ rows }: { rows: readonly TrialHistoryRow[] }) {
  if (rows.length === 0) return <p className="text-sm muted">No specimens placed.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="data" data-testid="report-history">
        <thead>
          <tr>
            <th scope="col">Specimen</th><th scope="col">Parent piece · slice</th><th scope="col">Chloride</th>
            <th scope="col">Akaganeite</th><th scope="col">Treated before</th><th scope="col">First mass (g)</th><th scope="col">Mass change over the trial</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.id}>
              <th scope="row">{r.label}</th>
              <td>{r.parentPiece || r.slice ? [r.parentPiece || "—", r.slice || "—"].join(" · ") : <span className="muted">not recorded</span>}</td>
              <td>{CHLORIDE_STATE_LABELS[r.chlorideState]}</td>
              <td>{r.akaganeiteSeen === null ? <span className="muted">not checked</span> : r.akaganeiteSeen ? "seen" : "not seen"}</td>
              <td>{r.priorTreatments.length ? r.priorTreatments.join("; ") : <span className="muted">none recorded</span>}</td>
              <td className="tabular-nums">{r.firstWeighing ? <>{r.firstWeighing.massG} <span className="muted text-xs">({r.firstWeighing.measuredOn})</span></> : <span className="muted">not weighed</span>}</td>
              <td className="tabular-nums whitespace-nowrap">
                {r.trialChange
                  ? `${signed(r.trialChange.step.changeG * 1000, 1)} mg (${signed(r.trialChange.step.changePercent, 3)} %) over ${r.trialChange.step.days} d`
                  : <span className="muted">needs a weighing by day 0 and a later one</span>}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
