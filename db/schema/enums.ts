import { pgEnum } from "drizzle-orm/pg-core";

export const roleEnum = pgEnum("role", ["lead", "researcher", "technician", "observer"]);
export const chamberKindEnum = pgEnum("chamber_kind", [
  "saturated-salt", "desiccant", "water", "vacuum", "inert-gas", "open-shelf", "other",
]);
export const readingSourceEnum = pgEnum("reading_source", ["manual", "csv", "api"]);
export const desiccantEventKindEnum = pgEnum("desiccant_event_kind", ["charged", "regenerated", "replaced", "checked"]);
export const materialClassEnum = pgEnum("material_class", [
  "iron-meteorite", "stony-iron", "chondrite", "archaeological-iron", "steel-coupon", "other",
]);
export const treatmentKindEnum = pgEnum("treatment_kind", [
  "control", "coating", "cleaning", "chloride-removal", "storage-atmosphere", "other",
]);
export const trialStatusEnum = pgEnum("trial_status", ["draft", "running", "concluded"]);
export const trialMemberRoleEnum = pgEnum("trial_member_role", ["technician", "scorer"]);
export const scoreRuleEnum = pgEnum("score_rule", ["primary-scorer", "consensus"]);
export const photoStatusEnum = pgEnum("photo_status", ["pending", "ready", "failed"]);
export const silicateChangeEnum = pgEnum("silicate_change", ["none", "slight", "marked"]);
export const auditActionEnum = pgEnum("audit_action", ["create", "update", "delete"]);
// Where a chamber row sits in the collection tree: a trial jar, or a storage location (room → cabinet → …).
export const locationKindEnum = pgEnum("location_kind", ["trial-jar", "room", "cabinet", "case", "drawer", "sealed-box"]);
export const chlorideStateEnum = pgEnum("chloride_state", ["unknown", "not-detected", "present", "active", "desalinated"]);
