// Pure rules for a specimen's history: exact masses (integer tenths of a milligram, so 0.1 mg
// steps never pick up binary rounding), mass change over time, and the specimen's chloride state
// and akaganeite finding as used for blocking and as covariates.

/** 1 g = 10 000 tenths of a milligram. */
const TENTHS_MG_PER_G = 10_000;
const MS_PER_DAY = 86_400_000;

/** "12.3456" (g) or "12345.6" (mg) → integer tenths of a mg; null when the text has finer digits or is not a plain number. */
export function massToTenthMg(text: string, unit: "g" | "mg"): number | null {
  const m = /^(\d+)(?:\.(\d+))?$/.exec(text.trim());
  if (!m) return null;
  const places = unit === "g" ? 4 : 1;
  const frac = (m[2] ?? "").replace(/0+$/, "");
  if (frac.length > places) return null;
  return Number(m[1]) * 10 ** places + Number(frac.padEnd(places, "0") || "0");
}

/** Tenths of a mg → the grams text stored in numeric(12,4), e.g. 123456 → "12.3456". */
export function tenthMgToGramsText(tenths: number): string {
  const whole = Math.floor(tenths / TENTHS_MG_PER_G);
  return `${whole}.${String(tenths % TENTHS_MG_PER_G).padStart(4, "0")}`;
}

/** Whole days from one calendar date (YYYY-MM-DD) to another. */
export function daysBetween(fromOn: string, toOn: string): number {
  return Math.round((Date.parse(`${toOn}T00:00:00Z`) - Date.parse(`${fromOn}T00:00:00Z`)) / MS_PER_DAY);
}

/**
 * The latest calendar date anywhere on Earth right now (UTC+14), so "today" in the lab's own zone
 * is never refused as a future date, and tomorrow everywhere is.
 */
export function latestToday(now: Date = new Date()): string {
  return new Date(now.getTime() + 14 * 3_600_000).toISOString().slice(0, 10);
}

export type Weighing = { id?: string; measuredOn: string; massG: string };
export type MassStep = {
  days: number;
  changeG: number;
  changePercent: number;
  /** Null when both weighings are on the same day. */
  gPerDay: number | null;
  percentPerDay: number | null;
};
export type MassRow<W extends Weighing> = W & { sincePrevious: MassStep | null; sinceFirst: MassStep | null };

function step(from: Weighing, to: Weighing): MassStep {
  const a = massToTenthMg(from.massG, "g")!;
  const b = massToTenthMg(to.massG, "g")!;
  const days = daysBetween(from.measuredOn, to.measuredOn);
  const changeG = (b - a) / TENTHS_MG_PER_G;
  const changePercent = ((b - a) / a) * 100;
  return { days, changeG, changePercent, gPerDay: days > 0 ? changeG / days : null, percentPerDay: days > 0 ? changePercent / days : null };
}

/**
 * Weighings in date order (same-day weighings keep their given order), each with its change since
 * the previous weighing and since the first: grams, per cent of the earlier mass, and both per day.
 */
export function massChanges<W extends Weighing>(weighings: readonly W[]): MassRow<W>[] {
  const sorted = weighings.map((w, i) => ({ w, i })).sort((x, y) => (x.w.measuredOn < y.w.measuredOn ? -1 : x.w.measuredOn > y.w.measuredOn ? 1 : x.i - y.i)).map((x) => x.w);
  return sorted.map((w, i) => ({
    ...w,
    sincePrevious: i === 0 ? null : step(sorted[i - 1], w),
    sinceFirst: i === 0 ? null : step(sorted[0], w),
  }));
}

export type ChlorideState = "present" | "absent" | "inconclusive" | "untested";
export const CHLORIDE_STATE_LABELS: Record<ChlorideState, string> = {
  present: "chloride present", absent: "no chloride found", inconclusive: "chloride test inconclusive", untested: "not tested for chloride",
};

/** The result of the latest chloride test (by test date, then by entry time), or "untested". */
export function chlorideStateOf(tests: readonly { testedOn: string; result: string; createdAt?: Date | string }[]): ChlorideState {
  let latest: (typeof tests)[number] | null = null;
  for (const t of tests) {
    if (!latest || t.testedOn > latest.testedOn || (t.testedOn === latest.testedOn && String(t.createdAt ?? "") >= String(latest.createdAt ?? ""))) latest = t;
  }
  return latest ? (latest.result as ChlorideState) : "untested";
}

/** Akaganeite counts as seen once any check has seen it (it does not go away by itself). */
export function akaganeiteSeenOf(checks: readonly { seen: boolean }[]): boolean | null {
  return checks.length === 0 ? null : checks.some((c) => c.seen);
}

export type TrialMassChange = { from: Weighing; to: Weighing; step: MassStep };
export type HistoryBeforeTrial = {
  chlorideState: ChlorideState;
  akaganeiteSeen: boolean | null;
  /** Treatments dated before the start day, oldest first. */
  priorTreatments: string[];
  /** The specimen's earliest weighing, whenever it was. */
  firstWeighing: Weighing | null;
  /** From the last weighing on or before the start day to the last one after it up to the end day; null without both. */
  trialChange: TrialMassChange | null;
};

/** A state entry (chloride test, akaganeite check, treatment) counts for a trial when dated before its start day. */
export const datedBeforeStart = (on: string, startOn: string) => on < startOn;
/** A weighing counts as the trial's baseline when made on or before its start day. */
export const weighedByStart = (on: string, startOn: string) => on <= startOn;

/**
 * What a specimen's history says about it at a trial: chloride state, akaganeite and treatments
 * from entries dated before the start day (as loadHistoryFactors), its first weighing, and its
 * mass change over the trial (a weighing on the start day counts as the baseline).
 */
export function historyBeforeTrial(h: {
  chlorideTests: readonly { testedOn: string; result: string; createdAt?: Date | string }[];
  akaganeiteChecks: readonly { checkedOn: string; seen: boolean }[];
  priorTreatments: readonly { treatedOn: string; treatment: string }[];
  weighings: readonly Weighing[];
}, startOn: string | null, endOn: string): HistoryBeforeTrial {
  const before = (on: string) => startOn === null || datedBeforeStart(on, startOn);
  const weighings = massChanges(h.weighings);
  const baseline = startOn === null ? undefined : weighings.filter((w) => weighedByStart(w.measuredOn, startOn)).at(-1);
  const final = baseline ? weighings.filter((w) => w.measuredOn > baseline.measuredOn && w.measuredOn <= endOn).at(-1) : undefined;
  const plain = (w: Weighing): Weighing => ({ measuredOn: w.measuredOn, massG: w.massG });
  return {
    chlorideState: chlorideStateOf(h.chlorideTests.filter((t) => before(t.testedOn))),
    akaganeiteSeen: akaganeiteSeenOf(h.akaganeiteChecks.filter((c) => before(c.checkedOn))),
    priorTreatments: h.priorTreatments.filter((t) => before(t.treatedOn)).sort((a, b) => (a.treatedOn < b.treatedOn ? -1 : a.treatedOn > b.treatedOn ? 1 : 0)).map((t) => t.treatment),
    firstWeighing: weighings[0] ? plain(weighings[0]) : null,
    trialChange: baseline && final ? { from: plain(baseline), to: plain(final), step: step(baseline, final) } : null,
  };
}
