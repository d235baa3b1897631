// Where a desiccant jar's charge stands: the water budget (./desiccant) and the exhaustion date
// counted from the last charge, and the uptake measured by weighing. Pure: the caller loads the
// chamber and its desiccant events.
import { bufferCapacityGPerG, desiccantBudget, desiccantCapacityGPerG, DESICCANTS, projectedExhaustionDate, type DesiccantBudget, type DesiccantKind } from "./desiccant";

const DAY_MS = 86_400_000;

/** What the status needs of a chamber. */
export type ChamberForDesiccant = {
  desiccantKind: string | null;
  desiccantMassG: number | null;
  volumeL: number | null;
  roomRhPercent: number | null;
  airExchangePerDay: number | null;
  nominalTempC: number;
  setpointRhPercent: number;
  /** Band half-width: how far a humidity buffer may let the jar drift. */
  toleranceRhPercent?: number;
};
/** A desiccant event: charged, regenerated, replaced or checked, with the weighed mass if any. */
export type ChargeEvent = { kind: string; at: Date; massG: number | null };

/** Events that start a fresh charge; "checked" only records a weighing or a look. */
export const RESET_EVENTS = new Set(["charged", "regenerated", "replaced"]);

export type MeasuredUptake = { gainG: number; days: number; gPerDay: number; checkedAt: Date; exhaustionAt: Date | null };
export type DesiccantStatus<E extends ChargeEvent = ChargeEvent> = {
  budget: DesiccantBudget | null;
  /** Why no budget could be computed (missing volume, room RH…). */
  missing: string[];
  lastCharge: E | null;
  /** From the water budget, counted from the last charge. */
  budgetExhaustionAt: Date | null;
  /** From weighing: mass gained since the charge, extrapolated at the same rate to the capacity. */
  measured: MeasuredUptake | null;
  /** The earlier of the two projections: what reminders go by. */
  exhaustionAt: Date | null;
};

/**
 * Water budget (lib/humidity/desiccant) and exhaustion date counted from the last charge or
 * regeneration. When the charge was weighed at charging and again later ("checked"), the measured
 * uptake gives a second projection; the earlier date wins, since leaks and damp specimens usually
 * make a real jar load faster than the budget's assumptions.
 */
export function desiccantStatus<E extends ChargeEvent>(chamber: ChamberForDesiccant, events: readonly E[]): DesiccantStatus<E> {
  const byTime = [...events].sort((a, b) => b.at.getTime() - a.at.getTime());
  const lastCharge = byTime.find((e) => RESET_EVENTS.has(e.kind)) ?? null;
  const massG = lastCharge?.massG ?? chamber.desiccantMassG;
  const kind = chamber.desiccantKind && chamber.desiccantKind in DESICCANTS ? (chamber.desiccantKind as DesiccantKind) : null;
  const missing: string[] = [];
  if (!kind) missing.push("desiccant kind");
  if (massG == null) missing.push("desiccant mass");
  if (chamber.volumeL == null) missing.push("jar volume");
  if (chamber.roomRhPercent == null) missing.push("room RH");
  if (chamber.airExchangePerDay == null) missing.push("air exchanges per day");
  let budget: DesiccantBudget | null = null;
  if (!missing.length) {
    try {
      budget = desiccantBudget({ kind: kind!, massG: massG!, jarVolumeL: chamber.volumeL!, tempC: chamber.nominalTempC, insideRhPercent: chamber.setpointRhPercent, outsideRhPercent: chamber.roomRhPercent!, airExchangePerDay: chamber.airExchangePerDay!, toleranceRhPercent: chamber.toleranceRhPercent });
    } catch (err) {
      missing.push((err as Error).message);
    }
  }
  const budgetExhaustionAt = budget && lastCharge ? projectedExhaustionDate(lastCharge.at, budget) : null;

  let measured: MeasuredUptake | null = null;
  const weighed = lastCharge?.massG != null ? byTime.find((e) => e.kind === "checked" && e.massG != null && e.at > lastCharge.at) : undefined;
  if (lastCharge && weighed && kind) {
    const gainG = weighed.massG! - lastCharge.massG!;
    const days = (weighed.at.getTime() - lastCharge.at.getTime()) / DAY_MS;
    const rh = Math.min(100, Math.max(0, chamber.setpointRhPercent));
    const perG = DESICCANTS[kind].buffer ? bufferCapacityGPerG(kind, rh, chamber.toleranceRhPercent, true) : desiccantCapacityGPerG(kind, rh);
    if (gainG > 0 && days > 0) {
      const capacityG = perG == null ? null : perG * lastCharge.massG!;
      const gPerDay = gainG / days;
      const exhaustionAt = capacityG == null ? null : new Date(lastCharge.at.getTime() + (capacityG / gPerDay) * DAY_MS);
      measured = { gainG, days, gPerDay, checkedAt: weighed.at, exhaustionAt };
    }
  }
  const dates = [budgetExhaustionAt, measured?.exhaustionAt ?? null].filter((d): d is Date => d !== null);
  const exhaustionAt = dates.length ? new Date(Math.min(...dates.map((d) => d.getTime()))) : null;
  return { budget, missing, lastCharge, budgetExhaustionAt, measured, exhaustionAt };
}

