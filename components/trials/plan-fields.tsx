"use client";
// The inspection plan: fixed interval, geometric (rule shown) or a custom day list, with a preview of
// the dates if the trial started today at 09:00 UTC (the real dates follow the start).
import { useMemo, useState } from "react";
import { buildSchedule, GEOMETRIC_RULE_TEXT, planDays, type InspectionPlan } from "@/lib/schedule/plans";
import { parseDayList } from "@/lib/validation/trials";
import { formatDate } from "@/lib/format";

export function PlanFields({ initial, error }: { initial?: InspectionPlan; error?: string[] }) {
  const [kind, setKind] = useState<InspectionPlan["kind"]>(initial?.kind ?? "geometric");
  const [intervalDays, setIntervalDays] = useState(initial?.kind === "fixed" ? String(initial.intervalDays) : "7");
  const [fixedCount, setFixedCount] = useState(initial?.kind === "fixed" ? String(initial.count) : "8");
  const [geoCount, setGeoCount] = useState(initial?.kind === "geometric" ? String(initial.count) : "9");
  const [custom, setCustom] = useState(initial?.kind === "custom" ? initial.days.join(", ") : "0, 1, 3, 7, 14, 28");

  const preview = useMemo(() => {
    const plan: InspectionPlan = kind === "fixed" ? { kind, intervalDays: Number(intervalDays), count: Number(fixedCount) }
      : kind === "geometric" ? { kind, count: Number(geoCount) } : { kind, days: parseDayList(custom) };
    try {
      const start = new Date();
      start.setUTCHours(9, 0, 0, 0);
      const days = planDays(plan);
      return { days, dates: buildSchedule(plan, start), error: null };
    } catch (e) {
      return { days: [], dates: [], error: e instanceof Error ? e.message : "Not a valid plan." };
    }
  }, [kind, intervalDays, fixedCount, geoCount, custom]);

  const radio = (value: InspectionPlan["kind"], label: string) => (
    <label className="inline-flex items-center gap-1.5 text-sm">
      <input type="radio" name="planKind" value={value} checked={kind === value} onChange={() => setKind(value)} /> {label}
    </label>
  );
  return (
    <fieldset className="space-y-3 min-w-0" aria-describedby={error ? "plan-err" : "plan-preview"}>
      <legend className="text-sm font-medium">Inspection plan</legend>
      <div className="flex flex-wrap gap-4">{radio("fixed", "Fixed interval")}{radio("geometric", "Geometric")}{radio("custom", "Custom days")}</div>
      {kind === "fixed" && (
        <div className="flex flex-wrap gap-4">
          <label className="text-sm block">Every (days)<input className="field" style={{ width: "8rem" }} type="number" min={1} name="intervalDays" value={intervalDays} onChange={(e) => setIntervalDays(e.target.value)} /></label>
          <label className="text-sm block">Number of inspections<input className="field" style={{ width: "8rem" }} type="number" min={1} name="fixedCount" value={fixedCount} onChange={(e) => setFixedCount(e.target.value)} /></label>
        </div>
      )}
      {kind === "geometric" && (
        <div className="space-y-1">
          <label className="text-sm block">Number of inspections<input className="field" style={{ width: "8rem" }} type="number" min={1} max={20} name="geometricCount" value={geoCount} onChange={(e) => setGeoCount(e.target.value)} /></label>
          <p className="text-xs muted">{GEOMETRIC_RULE_TEXT}</p>
        </div>
      )}
      {kind === "custom" && (
        <label className="text-sm block">Days after the start (whole days, e.g. 0, 2, 5, 10)
          <input className="field" name="customDays" value={custom} onChange={(e) => setCustom(e.target.value)} />
        </label>
      )}
      <p className="text-xs muted">Day 0 is the start of exposure, when the specimens go into the jars (the baseline photo).</p>
      <div id="plan-preview" className="text-sm" aria-live="polite">
        {preview.error ? <p className="text-rust-600">{preview.error}</p> : (
          <p>
            <span className="muted">If started today at 09:00 UTC: </span>
            {preview.days.slice(0, 12).map((d, i) => <span key={d}>{i > 0 && " · "}<span className="whitespace-nowrap">day {d} ({formatDate(preview.dates[i])})</span></span>)}
            {preview.days.length > 12 && <span> · …{preview.days.length - 12} more, last day {preview.days[preview.days.length - 1]}</span>}
          </p>
        )}
      </div>
      {error && <p id="plan-err" role="alert" className="text-sm text-rust-600">{error.join(" ")}</p>}
    </fieldset>
  );
}
