// The small RH trace of an overview row: each day's highest RH over the last days as a polyline, with
// the location's rule as a line. Computed on the server; the table draws the strings it gets.

export const TRACE_WIDTH = 120;
export const TRACE_HEIGHT = 28;

export type TraceGeometry = { points: string; ruleY: number | null; label: string };

export function traceGeometry(points: readonly { dayMs: number; maxRhPercent: number }[], thresholdRhPercent: number | null, { days = 30, now = new Date() } = {}): TraceGeometry | null {
  if (points.length === 0) return null;
  const w = TRACE_WIDTH;
  const h = TRACE_HEIGHT;
  const values = points.map((p) => p.maxRhPercent);
  const top = Math.max(50, ...values, thresholdRhPercent ?? 0);
  const x = (dayMs: number) => Math.max(0, Math.min(w, w - ((now.getTime() - dayMs) / 86_400_000 / days) * w));
  const y = (rh: number) => h - (rh / top) * h;
  return {
    points: points.map((p) => `${x(p.dayMs).toFixed(1)},${y(p.maxRhPercent).toFixed(1)}`).join(" "),
    ruleY: thresholdRhPercent === null ? null : Math.round(y(thresholdRhPercent) * 10) / 10,
    label: `Daily highest RH over the last ${days} days, ${Math.min(...values).toFixed(0)}–${Math.max(...values).toFixed(0)} %RH${thresholdRhPercent !== null ? `; rule ${thresholdRhPercent} %RH` : ""}`,
  };
}
