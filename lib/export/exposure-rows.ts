// exposure.csv of the data package: what each placement's jar measured (lib/climate/exposure), one
// row per placement, with time above the default RH thresholds.
import { DEFAULT_THRESHOLDS_RH_PERCENT, type Exposure } from "@/lib/climate/exposure";
import type { ColumnSpec, TableSpec } from "./table-schema";

export type ExposurePlacement = { placementId: string; specimenId: string; chamberId: string; fromAt: Date; toAt: Date; open: boolean; exposure: Exposure };

const num = (name: string, from: string, description: string): ColumnSpec => ({ name, type: "number", from, description });
const aboveKey = (t: number) => `hoursAbove${String(t).replace(".", "_")}`;

export const EXPOSURE_TABLE: TableSpec = {
  name: "exposure", title: "Chamber exposure per placement",
  description: "Derived from the readings of each placement's chamber, corrected by applied hygrometer checks (linear drift between checks, the nearest check held before the first and after the last); each reading holds until the next, gaps over the chamber's gap limit not counted.",
  primaryKey: "placement_id",
  foreignKeys: [
    { fields: "placement_id", reference: { resource: "placements", fields: "id" } },
    { fields: "specimen_id", reference: { resource: "specimens", fields: "id" } },
    { fields: "chamber_id", reference: { resource: "chambers", fields: "id" } },
  ],
  columns: [
    { name: "placement_id", type: "string", from: "placementId", format: "uuid", constraints: { required: true } },
    { name: "specimen_id", type: "string", from: "specimenId", format: "uuid", constraints: { required: true } },
    { name: "chamber_id", type: "string", from: "chamberId", format: "uuid", constraints: { required: true } },
    { name: "from_at", type: "datetime", from: "fromAt" },
    { name: "to_at", type: "datetime", from: "toAt", description: "End of the placement, or of the export for a placement still open." },
    { name: "still_open", type: "boolean", from: "open" },
    { name: "readings", type: "integer", from: "readings" },
    num("logged_hours", "loggedHours", "Counted time, hours."),
    num("mean_rh_percent", "meanRhPercent", "Time-weighted mean of the corrected readings, %RH."),
    num("out_of_band_share", "outOfBandShare", "Share (0–1) of counted time outside the chamber's setpoint ± tolerance."),
    ...DEFAULT_THRESHOLDS_RH_PERCENT.map((t) => num(`hours_above_${t}_rh`, aboveKey(t), `Hours with corrected RH above ${t} %RH.`)),
    num("hours_with_temp", "hoursWithTemp", "Counted hours with a logged temperature."),
    num("hours_condensation_risk", "hoursCondensationRisk", "Hours with the dew point within 2 °C of the air temperature."),
    { name: "corrected", type: "boolean", from: "corrected", description: "Some readings were corrected by hygrometer checks." },
  ],
};

export function exposureRows(placements: readonly ExposurePlacement[]) {
  return placements.map((p) => {
    const e = p.exposure;
    const above = Object.fromEntries(DEFAULT_THRESHOLDS_RH_PERCENT.map((t) => [aboveKey(t), (e.above.find((a) => a.thresholdRhPercent === t)?.minutes ?? NaN) / 60]));
    return {
      placementId: p.placementId, specimenId: p.specimenId, chamberId: p.chamberId, fromAt: p.fromAt, toAt: p.toAt, open: p.open,
      readings: e.readings, loggedHours: e.countedMinutes / 60, meanRhPercent: e.meanRhPercent, outOfBandShare: e.outOfBandShare,
      ...above, hoursWithTemp: e.minutesWithTemp / 60, hoursCondensationRisk: e.condensationMinutes / 60, corrected: e.corrected,
    };
  });
}
