// The tables of a trial's data package: names, column types and keys. Each column names the property
// of the source row it comes from, so the CSV header and the schema are one list by construction.
import type { ColumnSpec, FieldType, TableSpec } from "./table-schema";

type Extra = Omit<ColumnSpec, "name" | "type" | "from">;
const col = (name: string, type: FieldType, from: string, extra: Extra = {}): ColumnSpec => ({ name, type, from, ...extra });
const id = (name: string, from: string, description?: string): ColumnSpec =>
  col(name, "string", from, { format: "uuid", constraints: { required: true }, ...(description ? { description } : {}) });
const ref = (name: string, from: string, description?: string): ColumnSpec =>
  col(name, "string", from, { format: "uuid", ...(description ? { description } : {}) });
const fk = (field: string, resource: string) => ({ fields: field, reference: { resource, fields: "id" } });

export const TRIAL_TABLE: TableSpec = {
  name: "trial", title: "Trial", description: "The trial this package describes (one row).",
  primaryKey: "id",
  columns: [
    id("id", "id"), col("title", "string", "title"), col("question", "string", "question"),
    col("hypothesis", "string", "hypothesis"), col("status", "string", "status", { constraints: { enum: ["draft", "running", "concluded"] } }),
    col("replicates_per_arm", "integer", "replicatesPerArm"), col("allocation_seed", "string", "allocationSeed"),
    col("schedule_plan", "object", "schedulePlan", { description: "Inspection plan as JSON (kind fixed / geometric / custom)." }),
    col("score_rule", "string", "scoreRule"), col("started_at", "datetime", "startedAt"), col("concluded_at", "datetime", "concludedAt"),
  ],
};

export const SPECIMEN_TABLE: TableSpec = {
  name: "specimens", title: "Specimens", description: "Specimens placed in the trial.",
  primaryKey: "id",
  columns: [
    id("id", "id"), col("label", "string", "label", { constraints: { required: true } }), col("material_class", "string", "materialClass"),
    col("find_name", "string", "findName"), col("description", "string", "description"), col("face", "string", "face"),
    col("surface_prep", "string", "surfacePrep"), col("mass_g", "number", "massG", { description: "Mass in grams." }),
    col("history", "string", "history"), col("contamination_notes", "string", "contaminationNotes"),
    col("parent_piece", "string", "parentPiece", { description: "The piece this specimen was cut from." }),
    col("slice", "string", "slice", { description: "This slice's mark on the parent piece." }),
    col("provenance", "string", "provenance"),
  ],
};

export const TREATMENT_TABLE: TableSpec = {
  name: "treatments", title: "Treatments", description: "Treatments used in the trial.",
  primaryKey: "id",
  columns: [id("id", "id"), col("name", "string", "name"), col("kind", "string", "kind"), col("description", "string", "description"), col("protocol", "string", "protocol")],
};

export const CHAMBER_TABLE: TableSpec = {
  name: "chambers", title: "Chambers", description: "Sealed chambers (jars) used in the trial and their target humidity.",
  primaryKey: "id",
  columns: [
    id("id", "id"), col("name", "string", "name"), col("kind", "string", "kind"), col("salt_id", "string", "saltId"),
    col("desiccant_kind", "string", "desiccantKind"), col("desiccant_mass_g", "number", "desiccantMassG"),
    col("nominal_temp_c", "number", "nominalTempC", { description: "°C" }), col("volume_l", "number", "volumeL", { description: "Litres." }),
    col("setpoint_rh_percent", "number", "setpointRhPercent", { description: "Target relative humidity, %RH." }),
    col("tolerance_rh_percent", "number", "toleranceRhPercent", { description: "± %RH around the setpoint." }),
    col("notes", "string", "notes"),
  ],
};

export const PLACEMENT_TABLE: TableSpec = {
  name: "placements", title: "Placements", description: "Which specimen sat in which chamber under which treatment, from when to when.",
  primaryKey: "id",
  foreignKeys: [fk("trial_id", "trial"), fk("specimen_id", "specimens"), fk("chamber_id", "chambers"), fk("treatment_id", "treatments")],
  columns: [
    id("id", "id"), id("trial_id", "trialId"), id("specimen_id", "specimenId"), id("chamber_id", "chamberId"), id("treatment_id", "treatmentId"),
    ref("arm_id", "armId"), col("from_at", "datetime", "fromAt"), col("to_at", "datetime", "toAt"), col("reason", "string", "reason"),
  ],
};

export const INSPECTION_TABLE: TableSpec = {
  name: "inspections", title: "Inspections", description: "Planned and done inspections; done_at is empty for those not done yet.",
  primaryKey: "id",
  foreignKeys: [fk("trial_id", "trial")],
  columns: [
    id("id", "id"), id("trial_id", "trialId"), col("day_number", "integer", "dayNumber", { description: "Planned day after the start." }),
    col("planned_at", "datetime", "plannedAt"), col("done_at", "datetime", "doneAt"), ref("done_by", "doneBy", "User id (pseudonymous)."),
    col("reschedule_reason", "string", "rescheduleReason"), col("notes", "string", "notes"),
  ],
};

export const PHOTO_TABLE: TableSpec = {
  name: "photos", title: "Photo manifest", description: "Inspection photos: object key in storage, SHA-256 checksum, size and capture time. The image files are not in this package.",
  primaryKey: "id",
  foreignKeys: [fk("specimen_id", "specimens"), fk("inspection_id", "inspections")],
  columns: [
    id("id", "id"), id("specimen_id", "specimenId"), ref("inspection_id", "inspectionId"), col("object_key", "string", "objectKey"),
    col("filename", "string", "filename"), col("content_type", "string", "contentType"), col("size_bytes", "integer", "sizeBytes"),
    col("sha256", "string", "sha256", { description: "Hex SHA-256 of the uploaded file." }), col("width", "integer", "width"),
    col("height", "integer", "height"), col("captured_at", "datetime", "capturedAt", { description: "EXIF capture time." }),
    col("status", "string", "status"),
  ],
};

export const SCORE_TABLE: TableSpec = {
  name: "scores", title: "Scores", description: "Rust scores per specimen per inspection; is_record marks the score the analysis uses, blind a score made without seeing the treatment.",
  primaryKey: "id",
  foreignKeys: [fk("inspection_id", "inspections"), fk("specimen_id", "specimens"), fk("photo_id", "photos")],
  columns: [
    id("id", "id"), id("inspection_id", "inspectionId"), id("specimen_id", "specimenId"), ref("photo_id", "photoId"),
    ref("scorer_id", "scorerId", "User id (pseudonymous)."), col("blind", "boolean", "blind"), col("is_record", "boolean", "isRecord"),
    col("spot_count", "integer", "spotCount"), col("area_percent", "number", "areaPercent", { description: "Rusted area of the face, %." }),
    col("area_mm2", "number", "areaMm2", { description: "Rusted area in mm²: area_percent of the face outline on the photo at the photo's scale; empty without both." }),
    col("astm_grade", "integer", "astmGrade", { description: "ASTM D610 grade 0–10." }), col("astm_letter", "string", "astmLetter"),
    col("iso_degree", "integer", "isoDegree", { description: "ISO 4628-3 Ri 0–5." }), col("auto_estimate_percent", "number", "autoEstimatePercent"),
    col("weeping", "boolean", "weeping"), col("silicate_change", "string", "silicateChange"), col("no_change", "boolean", "noChange"),
    col("notes", "string", "notes"), col("updated_at", "datetime", "updatedAt"),
  ],
};

export const READING_TABLE: TableSpec = {
  name: "readings", title: "Chamber readings", description: "Hygrometer and logger readings of the trial's chambers between its start and end.",
  primaryKey: "id",
  foreignKeys: [fk("chamber_id", "chambers")],
  columns: [
    col("id", "integer", "id", { constraints: { required: true } }), id("chamber_id", "chamberId"), col("taken_at", "datetime", "takenAt"),
    col("rh_percent", "number", "rhPercent", { description: "%RH" }), col("temp_c", "number", "tempC", { description: "°C" }),
    col("dew_point_c", "number", "dewPointC", { description: "°C" }), col("source", "string", "source"), col("instrument", "string", "instrument"),
  ],
};

export const OUTCOME_TABLE: TableSpec = {
  name: "outcomes", title: "Per-specimen outcomes", description: "Derived from scores of record at done inspections: time to first rust as (last clean, first rusted] in days since the trial start; an empty upper end means never seen rusted (right-censored at the lower end).",
  primaryKey: "placement_id",
  foreignKeys: [fk("placement_id", "placements"), fk("specimen_id", "specimens")],
  columns: [
    id("placement_id", "placementId"), id("specimen_id", "specimenId"), col("specimen_label", "string", "specimenLabel"),
    col("material_class", "string", "materialClass"), col("chamber", "string", "chamberName"), col("treatment", "string", "treatmentName"),
    col("arm", "string", "armLabel"), col("inspections_scored", "integer", "inspectionsScored"),
    col("interval_lower_day", "number", "intervalLowerDay", { description: "Last clean inspection, days since start." }),
    col("interval_upper_day", "number", "intervalUpperDay", { description: "First rusted inspection, days since start; empty if none." }),
    col("rusted", "boolean", "rusted"), col("right_censored", "boolean", "rightCensored"),
    col("final_area_percent", "number", "finalAreaPercent", { description: "Rusted area % at the last scored inspection." }),
    col("final_area_mm2", "number", "finalAreaMm2", { description: "Rusted area in mm² at the last scored inspection; empty without a photo scale and face outline." }),
    col("growth_mm2_per_day", "number", "growthMm2PerDay", { description: "Least-squares slope of rusted area (mm²) on days since start over the scaled inspections; empty with fewer than two." }),
    col("final_day", "number", "finalDay"), col("weeping_seen", "boolean", "weepingSeen"),
    col("entry_day", "number", "entryDay", { description: "Days since start when this placement came under observation: 0 for a specimen's first jar, the move's day for a later one." }),
    col("rusted_earlier", "boolean", "rustedEarlier", { description: "Seen rusted in an earlier placement: not at risk here, left out of the survival analysis." }),
    col("weeping_lower_day", "number", "weepingLowerDay", { description: "Last inspection without weeping, days since start." }),
    col("weeping_upper_day", "number", "weepingUpperDay", { description: "First inspection with weeping, days since start; empty if none." }),
  ],
};

export const STORAGE_RULE_TABLE: TableSpec = {
  name: "storage_rules", title: "Storage rules", description: "Storage rules the lab accepted from this trial's humidity response, every version (superseded ones have superseded_at).",
  primaryKey: "id",
  columns: [
    id("id", "id"), col("version", "integer", "version"), col("material_class", "string", "materialClass"),
    ref("treatment_id", "treatmentId"), col("treatment", "string", "treatmentName"),
    col("threshold_rh_percent", "number", "thresholdRhPercent", { description: "Keep below this relative humidity, %RH." }),
    col("lower95_rh_percent", "number", "lower95RhPercent", { description: "95 % lower limit, %RH; empty if not bounded." }),
    col("upper95_rh_percent", "number", "upper95RhPercent", { description: "95 % upper limit, %RH; empty if not bounded." }),
    col("share_rusted", "number", "shareRusted", { description: "Share of specimens rusted (0–1) the threshold is read at." }),
    col("horizon_days", "number", "horizonDays", { description: "Storage horizon, days." }),
    col("method", "string", "method"), col("statement", "string", "statement"),
    col("source_trial_ids", "string", "sourceTrialIdsText", { description: "Trials the rule rests on: ids separated by spaces." }),
    col("note", "string", "note"), ref("accepted_by", "acceptedBy", "Pseudonymous user id."), col("accepted_at", "datetime", "acceptedAt"),
    col("superseded_at", "datetime", "supersededAt"),
  ],
};
