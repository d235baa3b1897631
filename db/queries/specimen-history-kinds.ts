import "server-only";
// The four kinds of dated history entry of a specimen as stored: table, audit entity, name, the day
// each is dated by, and the columns an entry sets. Recording (specimen-history.ts) and correcting
// (specimen-history-edit.ts) both write through these, so a column is mapped once.
import { massToTenthMg, tenthMgToGramsText } from "@/lib/specimens/history";
import type { HistoryEntryInput } from "@/lib/validation/specimen-history";
import { akaganeiteChecks, chlorideTests, massMeasurements, priorTreatments } from "../schema";

export const HISTORY_TABLES = {
  chloride: { table: chlorideTests, entity: "chloride_test", name: "Chloride test", on: (r: { testedOn: string }) => r.testedOn },
  akaganeite: { table: akaganeiteChecks, entity: "akaganeite_check", name: "Akaganeite check", on: (r: { checkedOn: string }) => r.checkedOn },
  treatment: { table: priorTreatments, entity: "prior_treatment", name: "Treatment", on: (r: { treatedOn: string }) => r.treatedOn },
  mass: { table: massMeasurements, entity: "mass_measurement", name: "Weighing", on: (r: { measuredOn: string }) => r.measuredOn },
} as const;

export type HistoryRow = Record<string, unknown> & { id: string };

/** The columns an entry sets, by kind (the mass normalised to grams to 0.1 mg), on entry and on correction alike. */
export function historyValues(input: HistoryEntryInput) {
  switch (input.kind) {
    case "chloride": return { testedOn: input.testedOn, method: input.method, result: input.result, notes: input.notes };
    case "akaganeite": return { checkedOn: input.checkedOn, method: input.method, seen: input.seen === "yes", notes: input.notes };
    case "treatment": return { treatedOn: input.treatedOn, treatment: input.treatment, notes: input.notes };
    case "mass": return { measuredOn: input.measuredOn, massG: tenthMgToGramsText(massToTenthMg(input.mass, input.unit)!), notes: input.notes };
  }
}

/** What an audit summary of a new entry adds after "<name> of <label> on <day>". */
export function historyOutcome(values: ReturnType<typeof historyValues>): string {
  if ("result" in values) return `: ${values.result}`;
  if ("seen" in values) return `: ${values.seen ? "seen" : "not seen"}`;
  if ("massG" in values) return `: ${values.massG} g`;
  return " recorded";
}
