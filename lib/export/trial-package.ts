// A trial's data package: which tables go in, in which order, and the README beside them. Pure:
// db/queries/analysis.ts loads the rows and the outcomes, package-zip.ts writes the zip.
import type { SpecimenOutcome } from "@/lib/analysis/derive";
import { toPackageName } from "./datapackage";
import { AKAGANEITE_CHECK_TABLE, CHLORIDE_TEST_TABLE, MASS_MEASUREMENT_TABLE, PRIOR_TREATMENT_TABLE } from "./history-tables";
import { EXPOSURE_TABLE, exposureRows, type ExposurePlacement } from "./exposure-rows";
import type { OutcomeAreas } from "@/lib/scoring/scaled-areas";
import { outcomeRows } from "./outcome-rows";
import { buildPackageZip, type PackageTable } from "./package-zip";
import { formatDateTime } from "./table-schema";
import {
  CHAMBER_TABLE, INSPECTION_TABLE, OUTCOME_TABLE, PHOTO_TABLE, PLACEMENT_TABLE, READING_TABLE, SCORE_TABLE, SPECIMEN_TABLE, STORAGE_RULE_TABLE, TREATMENT_TABLE, TRIAL_TABLE,
} from "./trial-tables";

/** What the package needs of the trial row (the whole row goes into trial.csv). */
export type PackagedTrial = { title: string; question: string };

/** The trial's rows, one list per table. */
export type TrialExportRows = {
  specimenRows: readonly object[];
  treatmentRows: readonly object[];
  chamberRows: readonly object[];
  placementRows: readonly object[];
  inspectionRows: readonly object[];
  photoRows: readonly object[];
  scoreRows: readonly object[];
  readingRows: readonly object[];
  /** Storage rules accepted from the trial (every version). */
  storageRuleRows?: readonly { sourceTrialIds: readonly string[] }[];
  /** Specimen history of the package's specimens (every entry, whatever its date). */
  chlorideTestRows?: readonly object[];
  akaganeiteCheckRows?: readonly object[];
  priorTreatmentRows?: readonly object[];
  massMeasurementRows?: readonly object[];
};

const packageReadme = (trial: PackagedTrial, created: Date) => `# ${trial.title}

${trial.question}

Exported from Rustline on ${formatDateTime(created)} as a Frictionless Tabular Data Package
(https://specs.frictionlessdata.io/tabular-data-package/). \`datapackage.json\` describes every CSV
under \`data/\`: column types, primary and foreign keys, byte size and SHA-256 checksum.

- \`outcomes.csv\` is derived: for each placement, time to first rust as (last clean inspection,
  first rusted inspection] in days since the trial start, from scores of record at done inspections.
  An empty upper end means the specimen was never seen rusted (right-censored at the lower end).
- \`exposure.csv\` is derived: for each placement, what its chamber measured — time-weighted mean RH,
  share of time out of the chamber's band, hours above 25 and 60 %RH and hours with the dew point within
  2 °C of the air temperature — from the readings corrected by applied hygrometer checks (linear drift
  between checks; the nearest check held before the first and after the last).
- \`chloride_tests.csv\`, \`akaganeite_checks.csv\`, \`prior_treatments.csv\` and \`mass_measurements.csv\`
  are the specimens' history as recorded, before, during and after the trial (dates are the lab's
  calendar days; masses in grams to 0.1 mg). Mass change is the difference between two weighings.
- \`photos.csv\` is a manifest: the image files stay in the lab's object storage; check a copy
  against its \`sha256\`.
- User ids (scorer_id, done_by) are pseudonymous; \`blind\` marks scores made without seeing the treatment.
- Times are UTC to the whole second (\`2026-03-01T09:30:00Z\`).
- Text cells that would start with \`=\`, \`+\`, \`-\`, \`@\`, a tab or a carriage return begin with a
  leading \`'\` guard, so a spreadsheet shows them as text instead of running them as formulas (a text
  cell already starting with \`'\` before such a character gets one more). Remove one leading \`'\`
  from such a cell to get the value as typed. Number, date and boolean cells are never changed.

These results guide storage decisions; they do not replace a conservator's judgement.
`;

/** The zip of a trial's tables, their descriptor and the README, with its download name. */
export async function trialDataPackage({ trial, rows, outcomes, exposure = [], areas, now }: {
  trial: PackagedTrial; rows: TrialExportRows; outcomes: readonly SpecimenOutcome[]; exposure?: readonly ExposurePlacement[]; areas?: ReadonlyMap<string, OutcomeAreas>; now: Date;
}) {
  const tables: PackageTable[] = [
    { spec: TRIAL_TABLE, rows: [trial] },
    { spec: SPECIMEN_TABLE, rows: rows.specimenRows },
    { spec: TREATMENT_TABLE, rows: rows.treatmentRows },
    { spec: CHAMBER_TABLE, rows: rows.chamberRows },
    { spec: PLACEMENT_TABLE, rows: rows.placementRows },
    { spec: INSPECTION_TABLE, rows: rows.inspectionRows },
    { spec: PHOTO_TABLE, rows: rows.photoRows },
    { spec: SCORE_TABLE, rows: rows.scoreRows },
    { spec: READING_TABLE, rows: rows.readingRows },
    { spec: OUTCOME_TABLE, rows: outcomeRows(outcomes, areas) },
    { spec: EXPOSURE_TABLE, rows: exposureRows(exposure) },
    { spec: CHLORIDE_TEST_TABLE, rows: rows.chlorideTestRows ?? [] },
    { spec: AKAGANEITE_CHECK_TABLE, rows: rows.akaganeiteCheckRows ?? [] },
    { spec: PRIOR_TREATMENT_TABLE, rows: rows.priorTreatmentRows ?? [] },
    { spec: MASS_MEASUREMENT_TABLE, rows: rows.massMeasurementRows ?? [] },
    { spec: STORAGE_RULE_TABLE, rows: (rows.storageRuleRows ?? []).map((r) => ({ ...r, sourceTrialIdsText: r.sourceTrialIds.join(" ") })) },
  ];
  const name = toPackageName(`rustline-${trial.title}`);
  const result = await buildPackageZip({
    name,
    title: trial.title,
    description: `${trial.question} Specimens, treatments, chambers, placements, inspections, scores, chamber readings, a photo manifest, per-specimen outcomes, per-placement chamber exposure, the specimens' history (chloride tests, akaganeite checks, treatments, weighings) and the storage rules accepted from the trial.`,
    created: now,
    keywords: ["corrosion", "relative humidity", "time to first rust", "interval-censored"],
    readme: packageReadme(trial, now),
    tables,
  });
  return { ...result, filename: `${name}.zip` };
}
