// Where an inspection stands relative to now, for the due list and the reminder e-mails.
//
// Exact rule (also shown in the UI):
//   done      — it has a done time, whenever that was;
//   overdue   — not done and planned more than graceHours before now;
//   due       — not done, planned no earlier than now − graceHours and before the end of tomorrow
//               (midnight starting the day after tomorrow, on the lab's calendar, UTC by default);
//   upcoming  — not done and planned from the day after tomorrow on.
// Boundaries: planned exactly at now − graceHours is due; planned exactly at the day-after-tomorrow
// midnight is upcoming.
import { assertValidDate, DAY_MS, startOfDay } from "./calendar";

export type InspectionStatus = "done" | "due" | "overdue" | "upcoming";
export type InspectionTiming = { plannedAt: Date; doneAt?: Date | null };
export type StatusOptions = { timeZone?: string };

/** Hours past its planned time before a not-done inspection counts as overdue (the product's choice). */
export const OVERDUE_GRACE_HOURS = 6;

export const STATUS_RULE_TEXT =
  "Due: planned for today or tomorrow, or already past but still within the grace period. " +
  "Overdue: past the planned time by more than the grace period. Upcoming: planned after tomorrow.";

export function inspectionStatus(
  inspection: InspectionTiming,
  now: Date,
  graceHours: number,
  options: StatusOptions = {},
): InspectionStatus {
  assertValidDate(now, "now");
  assertValidDate(inspection.plannedAt, "plannedAt");
  if (!Number.isFinite(graceHours) || graceHours < 0) {
    throw new RangeError(`graceHours must be a finite number ≥ 0, got ${graceHours}`);
  }
  if (inspection.doneAt != null) return "done";
  const planned = inspection.plannedAt.getTime();
  if (planned < now.getTime() - graceHours * 3_600_000) return "overdue";
  if (planned >= startOfDay(now, 2, options.timeZone).getTime()) return "upcoming";
  return "due";
}

/**
 * Inspections not yet done and planned no later than now + days (overdue ones included: they still
 * need doing), earliest first. Used for the due list and for choosing whom to remind.
 */
export function dueWithin<T extends InspectionTiming>(list: readonly T[], now: Date, days: number): T[] {
  assertValidDate(now, "now");
  if (!Number.isFinite(days) || days < 0) throw new RangeError(`days must be a finite number ≥ 0, got ${days}`);
  const limit = now.getTime() + days * DAY_MS;
  return list
    .filter((i) => i.doneAt == null && i.plannedAt.getTime() <= limit)
    .sort((a, b) => a.plannedAt.getTime() - b.plannedAt.getTime());
}

/** The due page asks for this many open inspections at a time (earliest first) and offers more, up to 500. */
export const DUE_PAGE_SIZE = 50;
