// A small trace of a location's daily highest RH over the last 30 days, with its rule as a dashed line.
// Plain SVG from precomputed strings (lib/collection/rh-trace): one per overview row, no charting library.
import { TRACE_HEIGHT, TRACE_WIDTH, type TraceGeometry } from "@/lib/collection/rh-trace";

export function RhTrace({ trace }: { trace: TraceGeometry | null }) {
  if (!trace) return <span className="text-xs muted">no readings</span>;
  return (
    <svg width={TRACE_WIDTH} height={TRACE_HEIGHT} viewBox={`0 0 ${TRACE_WIDTH} ${TRACE_HEIGHT}`} role="img">
      <title>{trace.label}</title>
      {trace.ruleY !== null && <line x1={0} x2={TRACE_WIDTH} y1={trace.ruleY} y2={trace.ruleY} stroke="currentColor" strokeDasharray="3 2" strokeOpacity={0.5} />}
      <polyline points={trace.points} fill="none" stroke="var(--color-verdigris-600, #2f7d6d)" strokeWidth={1.5} />
    </svg>
  );
}
