// A small trace of a location's daily highest RH over the last 30 days, with its rule as a line.
// Server-rendered SVG: one per overview row, so no charting library is loaded for it.
export function RhTrace({ points, thresholdRhPercent, days = 30, now = new Date() }: {
  points: readonly { day: Date; maxRhPercent: number }[]; thresholdRhPercent: number | null; days?: number; now?: Date;
}) {
  const w = 120;
  const h = 28;
  if (points.length === 0) return <span className="text-xs muted">no readings</span>;
  const top = Math.max(100 / 2, ...points.map((p) => p.maxRhPercent), thresholdRhPercent ?? 0);
  const x = (d: Date) => Math.max(0, Math.min(w, w - ((now.getTime() - d.getTime()) / 86_400_000 / days) * w));
  const y = (rh: number) => h - (rh / top) * h;
  const line = points.map((p) => `${x(p.day).toFixed(1)},${y(p.maxRhPercent).toFixed(1)}`).join(" ");
  const label = `Daily highest RH over the last ${days} days, ${Math.min(...points.map((p) => p.maxRhPercent)).toFixed(0)}–${Math.max(...points.map((p) => p.maxRhPercent)).toFixed(0)} %RH${thresholdRhPercent !== null ? `; rule ${thresholdRhPercent} %RH` : ""}`;
  return (
    <svg width={w} height={h} viewBox={`0 0 ${w} ${h}`} role="img" aria-label={label}>
      <title>{label}</title>
      {thresholdRhPercent !== null && <line x1={0} x2={w} y1={y(thresholdRhPercent)} y2={y(thresholdRhPercent)} stroke="currentColor" strokeDasharray="3 2" strokeOpacity={0.5} />}
      <polyline points={line} fill="none" stroke="var(--color-verdigris-600, #2f7d6d)" strokeWidth={1.5} />
    </svg>
  );
}
