// The specimen-history tables of a trial's data package: every dated entry recorded for the
// trial's specimens (before, during and after the trial), one table per kind, each row keyed to
// specimens.csv. Columns name the property of the database row they come from (as trial-tables.ts).
import type { ColumnSpec, FieldType, TableSpec } from "./table-schema";

type Extra = Omit<ColumnSpec, "name" | "type" | "from">;
const col = (name: string, type: FieldType, from: string, extra: Extra = {}): ColumnSpec => ({ name, type, from, ...extra });
const common = (dateName: string, dateFrom: string, what: string) => ({
  head: [
    col("id", "string", "id", { format: "uuid", constraints: { required: true } }),
    col("specimen_id", "string", "specimenId", { format: "uuid", constraints: { required: true }, description: "The specimen (specimens.csv)." }),
    col(dateName, "date", dateFrom, { constraints: { required: true }, description: `Calendar day of the ${what} (YYYY-MM-DD, the lab's day).` }),
  ],
  tail: [
    col("notes", "string", "notes"),
    col("created_at", "datetime", "createdAt", { description: "When the entry was recorded (UTC)." }),
  ],
});
const toSpecimens = [{ fields: "specimen_id", reference: { resource: "specimens", fields: "id" } }];

const chloride = common("tested_on", "testedOn", "test");
export const CHLORIDE_TEST_TABLE: TableSpec = {
  name: "chloride_tests", title: "Chloride tests", description: "Tests of a specimen for chloride; the latest result before the trial start is its chloride state.",
  primaryKey: "id", foreignKeys: toSpecimens,
  columns: [
    ...chloride.head,
    col("method", "string", "method", { constraints: { enum: ["silver-nitrate-spot", "chloride-strip", "ion-chromatography", "titration", "other"] } }),
    col("result", "string", "result", { constraints: { enum: ["present", "absent", "inconclusive"] } }),
    ...chloride.tail,
  ],
};

const akaganeite = common("checked_on", "checkedOn", "check");
export const AKAGANEITE_CHECK_TABLE: TableSpec = {
  name: "akaganeite_checks", title: "Akaganeite checks", description: "Looks for akaganeite (β-FeOOH) on a specimen; seen is true when it was found.",
  primaryKey: "id", foreignKeys: toSpecimens,
  columns: [
    ...akaganeite.head,
    col("method", "string", "method", { constraints: { enum: ["visual", "microscope", "raman", "xrd", "other"] } }),
    col("seen", "boolean", "seen"),
    ...akaganeite.tail,
  ],
};

const treatment = common("treated_on", "treatedOn", "treatment");
export const PRIOR_TREATMENT_TABLE: TableSpec = {
  name: "prior_treatments", title: "Specimen treatments", description: "Treatments a specimen received outside the trial's arms (earlier conservation, cleaning, coatings), as recorded.",
  primaryKey: "id", foreignKeys: toSpecimens,
  columns: [...treatment.head, col("treatment", "string", "treatment", { constraints: { required: true } }), ...treatment.tail],
};

const mass = common("measured_on", "measuredOn", "weighing");
export const MASS_MEASUREMENT_TABLE: TableSpec = {
  name: "mass_measurements", title: "Weighings", description: "Dated weighings of a specimen; mass change is the difference between two rows of the same specimen.",
  primaryKey: "id", foreignKeys: toSpecimens,
  columns: [
    ...mass.head,
    col("mass_g", "number", "massG", { constraints: { required: true }, description: "Mass in grams to 0.1 mg (four decimals), exactly as stored." }),
    ...mass.tail,
  ],
};
