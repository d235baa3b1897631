// Hand-written expectations for tests/integration/auth-matrix.test.ts, one per entry point:
// - permission: what the entry point must declare (from what the product promises, not from the code);
// - empty: the answer an allowed role gets for an empty input with real ids of its own lab
//   (actions: the error code, or "ok"; routes: the HTTP status documented in README "HTTP API");
// - foreign: an input naming another lab's rows, valid in form, so the only reason to refuse is the lab
//   (answer 404 / "not-found" unless foreignAnswer says otherwise); absent when the entry point names
//   no existing row (it creates in the caller's lab, or acts on the caller's own account).
import type { Permission, Role } from "@/lib/auth/permissions";

export type Fixture = {
  chamberId: string; treatmentId: string; specimenId: string; otherSpecimenId: string; trialId: string; inspectionId: string;
  photoId: string; tokenId: string; checkId: string; weighingId: string; users: Record<Role, string>;
};
type Entry = {
  permission: Permission;
  empty: string | number;
  foreign?: (f: Fixture) => Record<string, unknown>;
  foreignAnswer?: "invalid";
};

// Entry points that are not lab-scoped, and what protects them instead.
export const PUBLIC_ACTIONS: Record<string, string> = {
  signUp: "public: mails a link that creates a new lab (or a note that the address has an account)",
  confirmSignUp: "public: needs a sealed sign-up link from that mail",
  signInWithPassword: "public: e-mail and password, throttled per account and per client address",
  acceptInvite: "public: needs a valid single-use invitation token",
};
export const PUBLIC_ROUTES: Record<string, string> = {
  "GET /api/auth/[...nextauth]": "next-auth (sign-in, session)",
  "POST /api/auth/[...nextauth]": "next-auth (CSRF token checked by next-auth)",
  "POST /api/chambers/[chamberId]/readings": "per-chamber logger token (Bearer)",
};

const at = { timeZone: "UTC" };
const trialForm = (f: Fixture) => ({
  title: "Cross-lab trial", question: "Can another lab's rows be used here?", "chamberIds[]": [f.chamberId], "treatmentIds[]": [f.treatmentId],
  replicatesPerArm: "1", planKind: "custom", customDays: "0 7",
});
const score = { spotCount: "0", areaPercent: "0", silicateChange: "none" };

const CHAMBER = "app/_actions/chamber-records.ts";
const CHAMBERS = "app/_actions/chambers.ts";
const COLLECTION = "app/_actions/collection.ts";
const SETTINGS = "app/_actions/settings.ts";
const SPECIMENS = "app/_actions/specimens.ts";
const HISTORY = "app/_actions/specimen-history.ts";
const TREATMENTS = "app/_actions/treatments.ts";
const SCORE = "app/_actions/scores.ts";
const PHOTOS = "app/_actions/photos.ts";
const ALIGN = "app/_actions/photo-align.ts";
const EVIDENCE = "app/_actions/photo-evidence.ts";
const SCHEDULE = "app/_actions/inspections.ts";
const SCORING = "app/_actions/scorers.ts";
const TRIALS = "app/_actions/trials.ts";
const RULES = "app/_actions/storage-rules.ts";

export const ENTRY_POINTS: Record<string, Entry> = {
  // ---- server actions ----
  [`${CHAMBER}#addReadingAction`]: { permission: "readings.write", empty: "invalid", foreign: (f) => ({ chamberId: f.chamberId, takenAt: "2026-01-05T10:00", ...at, rhPercent: "50" }) },
  [`${CHAMBER}#addDesiccantEventAction`]: { permission: "desiccant.write", empty: "invalid", foreign: (f) => ({ chamberId: f.chamberId, kind: "checked", at: "2026-01-05T10:00", ...at }) },
  [`${CHAMBER}#addHygrometerCheckAction`]: { permission: "readings.write", empty: "invalid", foreign: (f) => ({ chamberId: f.chamberId, instrument: "outsider logger", saltId: "NaCl", tempC: "20", readingRhPercent: "76", checkedAt: "2026-01-05T10:00", ...at, apply: "1" }) },
  [`${CHAMBER}#setCheckAppliedAction`]: { permission: "readings.write", empty: "invalid", foreign: (f) => ({ chamberId: f.chamberId, checkId: f.checkId, applied: "1" }) },
  [`${CHAMBER}#createTokenAction`]: { permission: "chambers.tokens", empty: "invalid", foreign: (f) => ({ chamberId: f.chamberId, label: "outsider's logger" }) },
  [`${CHAMBER}#revokeTokenAction`]: { permission: "chambers.tokens", empty: "invalid", foreign: (f) => ({ chamberId: f.chamberId, tokenId: f.tokenId }) },
  // Another lab's location as the parent, as the new place of one's own object, moved in the tree or edited: not found.
  [`${COLLECTION}#createLocationAction`]: { permission: "chambers.write", empty: "invalid", foreign: (f) => ({ name: "Outsider box", locationKind: "sealed-box", parentId: f.chamberId, kind: "open-shelf", nominalTempC: "20", setpointRhPercent: "45" }) },
  [`${COLLECTION}#reparentLocationAction`]: { permission: "chambers.write", empty: "invalid", foreign: (f) => ({ locationId: f.chamberId }) },
  [`${COLLECTION}#updateLocationAction`]: { permission: "chambers.write", empty: "invalid", foreign: (f) => ({ locationId: f.chamberId, name: "Outsider's cabinet", locationKind: "cabinet", keeperId: "", alertAfterHours: "6" }) },
  [`${COLLECTION}#moveObjectAction`]: { permission: "collection.move", empty: "invalid", foreign: (f) => ({ specimenId: f.specimenId, locationId: f.chamberId, at: "2026-01-05T10:00", ...at }) },
  [`${CHAMBERS}#createChamberAction`]: { permission: "chambers.write", empty: "invalid" },
  [`${CHAMBERS}#updateChamberAction`]: { permission: "chambers.write", empty: "invalid", foreign: (f) => ({ chamberId: f.chamberId, name: "Taken over", kind: "water", nominalTempC: "20" }) },
  [`${CHAMBERS}#archiveChamberAction`]: { permission: "chambers.write", empty: "invalid", foreign: (f) => ({ chamberId: f.chamberId, archive: "1" }) },
  [`${SETTINGS}#inviteMember`]: { permission: "members.manage", empty: "invalid" },
  [`${SETTINGS}#changeMemberRole`]: { permission: "members.manage", empty: "invalid", foreign: (f) => ({ userId: f.users.technician, role: "observer" }) },
  [`${SETTINGS}#changeOwnPassword`]: { permission: "lab.read", empty: "invalid" },
  [`${SETTINGS}#setReminderPreference`]: { permission: "lab.read", empty: "invalid" },
  [`${SETTINGS}#setCollectionDigest`]: { permission: "lab.read", empty: "invalid" },
  [`${SPECIMENS}#createSpecimenAction`]: { permission: "specimens.write", empty: "invalid" },
  [`${SPECIMENS}#updateSpecimenAction`]: { permission: "specimens.write", empty: "invalid", foreign: (f) => ({ specimenId: f.specimenId, label: "TAKEN-1", materialClass: "steel-coupon" }) },
  [`${SPECIMENS}#importSpecimensAction`]: { permission: "specimens.write", empty: "invalid" },
  [`${HISTORY}#addSpecimenHistoryAction`]: { permission: "history.record", empty: "invalid", foreign: (f) => ({ specimenId: f.specimenId, kind: "mass", measuredOn: "2026-01-05", mass: "12.3456", unit: "g" }) },
  [`${HISTORY}#updateSpecimenHistoryAction`]: { permission: "history.record", empty: "invalid", foreign: (f) => ({ specimenId: f.specimenId, entryId: f.weighingId, kind: "mass", measuredOn: "2026-01-05", mass: "12.3456", unit: "g" }) },
  [`${HISTORY}#deleteSpecimenHistoryAction`]: { permission: "history.record", empty: "invalid", foreign: (f) => ({ specimenId: f.specimenId, entryId: f.weighingId, kind: "mass", reason: "taken over" }) },
  [`${TREATMENTS}#createTreatmentAction`]: { permission: "treatments.write", empty: "invalid" },
  [`${TREATMENTS}#updateTreatmentAction`]: { permission: "treatments.write", empty: "invalid", foreign: (f) => ({ treatmentId: f.treatmentId, name: "Taken over", kind: "control" }) },
  // Looking after a recorded photo is part of taking photos (the same roles as uploading them).
  [`${PHOTOS}#acknowledgeCheckAction`]: { permission: "photos.upload", empty: "invalid", foreign: (f) => ({ photoId: f.photoId, note: "Clock was wrong; photo is right." }) },
  [`${PHOTOS}#movePhotoAction`]: { permission: "photos.upload", empty: "invalid", foreign: (f) => ({ photoId: f.photoId, inspectionId: f.inspectionId, specimenId: f.specimenId }) },
  [`${ALIGN}#saveControlPointsAction`]: { permission: "photos.upload", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, photoId: f.photoId, points: JSON.stringify([{ x: 10, y: 10 }, { x: 200, y: 150 }]) }) },
  [`${EVIDENCE}#savePhotoEvidenceAction`]: { permission: "photos.upload", empty: "invalid", foreign: (f) => ({ photoId: f.photoId, scaleMode: "typed", pxPerMm: "20", forSeries: "on" }) },
  [`${PHOTOS}#deletePhotoAction`]: { permission: "photos.upload", empty: "invalid", foreign: (f) => ({ photoId: f.photoId, confirmScores: "on" }) },
  [`${SCORE}#saveScoreAction`]: { permission: "scores.write", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, inspectionId: f.inspectionId, specimenId: f.specimenId, ...score }) },
  [`${SCORE}#saveConsensusAction`]: { permission: "scores.consensus", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, inspectionId: f.inspectionId, specimenId: f.specimenId, ...score }) },
  [`${SCHEDULE}#recordInspectionAction`]: { permission: "inspections.record", empty: "invalid", foreign: (f) => ({ inspectionId: f.inspectionId }) },
  [`${SCHEDULE}#rescheduleInspectionAction`]: { permission: "inspections.reschedule", empty: "invalid", foreign: (f) => ({ inspectionId: f.inspectionId, plannedAt: "2026-06-01T09:00", reason: "moved by an outsider" }) },
  [`${SCORING}#assignScorerAction`]: { permission: "scorers.assign", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, userId: f.users.technician, blind: "on" }) },
  [`${SCORING}#removeScorerAction`]: { permission: "scorers.assign", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, userId: f.users.technician }) },
  [`${SCORING}#setScoreRuleAction`]: { permission: "scorers.assign", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, scoreRule: "consensus" }) },
  [`${RULES}#acceptStorageRuleAction`]: { permission: "storageRules.accept", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, materialClass: "iron-meteorite", treatmentId: f.treatmentId, share: "10", horizon: "10" }) },
  // Entering a rule names no row but may name a treatment: another lab's treatment is refused as invalid input.
  [`${RULES}#enterStorageRuleAction`]: { permission: "storageRules.accept", empty: "invalid", foreign: (f) => ({ materialClass: "iron-meteorite", treatmentId: f.treatmentId, thresholdRhPercent: "30", source: "An outsider's note", sourceDate: "2020-01-01" }), foreignAnswer: "invalid" },
  // Creating a trial in the caller's lab from another lab's chambers and treatments: refused as invalid input.
  [`${TRIALS}#createTrialAction`]: { permission: "trials.write", empty: "invalid", foreign: trialForm, foreignAnswer: "invalid" },
  [`${TRIALS}#updateTrialAction`]: { permission: "trials.write", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, ...trialForm(f) }) },
  [`${TRIALS}#allocateAction`]: { permission: "trials.write", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, "specimenIds[]": [f.specimenId, f.otherSpecimenId], seed: "outsider" }) },
  [`${TRIALS}#swapAction`]: { permission: "trials.write", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, specimenA: f.specimenId, specimenB: f.otherSpecimenId, reason: "swapped by an outsider" }) },
  [`${TRIALS}#startTrialAction`]: { permission: "trials.write", empty: "invalid", foreign: (f) => ({ trialId: f.trialId }) },
  [`${TRIALS}#concludeTrialAction`]: { permission: "trials.conclude", empty: "invalid", foreign: (f) => ({ trialId: f.trialId }) },
  [`${TRIALS}#addNoteAction`]: { permission: "trials.notes", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, body: "an outsider's note" }) },
  [`${TRIALS}#moveSpecimenAction`]: { permission: "trials.write", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, specimenId: f.specimenId, reason: "moved by an outsider" }) },
  [`${TRIALS}#updateScorersAction`]: { permission: "scorers.assign", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, scorersIncluded: "1", "scorerIds[]": [], scoreRule: "consensus" }) },
  [`${TRIALS}#updateTechniciansAction`]: { permission: "trials.write", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, "technicianIds[]": [] }) },
  [`${TRIALS}#updateProtocolAction`]: { permission: "trials.write", empty: "invalid", foreign: (f) => ({ trialId: f.trialId, "photoProtocol[]": ["an outsider's line"] }) },

  // ---- route handlers (ids in the URL come from the fixture of the lab under test) ----
  "POST /api/chambers/[chamberId]/imports": { permission: "readings.write", empty: 422, foreign: () => ({}) },
  "GET /api/inspections/[inspectionId]": { permission: "lab.read", empty: 200 },
  "PATCH /api/inspections/[inspectionId]": { permission: "inspections.record", empty: 422, foreign: () => ({ action: "done", notes: "" }) },
  "GET /api/inspections": { permission: "lab.read", empty: 200 },
  "GET /api/marks": { permission: "scores.write", empty: 422 },
  // A redirect to a short-lived signed URL of the preview.
  "GET /api/photos/[photoId]/file": { permission: "lab.read", empty: 302 },
  "GET /api/photos/[photoId]": { permission: "lab.read", empty: 200 },
  "POST /api/photos/finalize": { permission: "photos.upload", empty: 422 },
  "POST /api/photos/presign": { permission: "photos.upload", empty: 422, foreign: (f) => ({ inspectionId: f.inspectionId, specimenId: f.specimenId, filename: "x.jpg", contentType: "image/jpeg", sizeBytes: 1000, sha256: "0".repeat(64) }) },
  "GET /api/scores/queue": { permission: "scores.write", empty: 422 },
  "POST /api/scores": { permission: "scores.write", empty: 422, foreign: (f) => ({ trialId: f.trialId, inspectionId: f.inspectionId, specimenId: f.specimenId, spotCount: 0, areaPercent: 0, silicateChange: "none" }) },
  "GET /api/specimens/[specimenId]": { permission: "lab.read", empty: 200 },
  "PATCH /api/specimens/[specimenId]": { permission: "specimens.write", empty: 200, foreign: () => ({ face: "taken over" }) },
  "GET /api/specimens/export": { permission: "export.read", empty: 200 },
  "GET /api/collection/overview": { permission: "export.read", empty: 200 },
  "POST /api/specimens/import": { permission: "specimens.write", empty: 422 },
  "GET /api/specimens": { permission: "lab.read", empty: 200 },
  "POST /api/specimens": { permission: "specimens.write", empty: 422 },
  "GET /api/treatments/[treatmentId]": { permission: "lab.read", empty: 200 },
  "PATCH /api/treatments/[treatmentId]": { permission: "treatments.write", empty: 200, foreign: () => ({ description: "taken over" }) },
  "GET /api/treatments": { permission: "lab.read", empty: 200 },
  "POST /api/treatments": { permission: "treatments.write", empty: 422 },
  "GET /api/trials/[trialId]/allocation": { permission: "lab.read", empty: 200 },
  "POST /api/trials/[trialId]/allocation": { permission: "trials.write", empty: 422, foreign: (f) => ({ specimenIds: [f.specimenId, f.otherSpecimenId], seed: "outsider" }) },
  "POST /api/trials/[trialId]/allocation/swap": { permission: "trials.write", empty: 422, foreign: (f) => ({ specimenA: f.specimenId, specimenB: f.otherSpecimenId, reason: "swapped by an outsider" }) },
  "GET /api/trials/[trialId]/analysis": { permission: "analysis.read", empty: 200 },
  "POST /api/trials/[trialId]/conclude": { permission: "trials.conclude", empty: 409, foreign: () => ({ note: "concluded by an outsider" }) },
  "GET /api/trials/[trialId]/export/datapackage.zip": { permission: "export.read", empty: 200 },
  "GET /api/trials/[trialId]/export/outcomes.csv": { permission: "export.read", empty: 200 },
  "GET /api/trials/[trialId]/notes": { permission: "lab.read", empty: 200 },
  "POST /api/trials/[trialId]/notes": { permission: "trials.notes", empty: 422, foreign: () => ({ body: "an outsider's note" }) },
  "GET /api/trials/[trialId]/placements": { permission: "lab.read", empty: 200 },
  "POST /api/trials/[trialId]/placements": { permission: "trials.write", empty: 422, foreign: (f) => ({ specimenId: f.specimenId, reason: "moved by an outsider" }) },
  "GET /api/trials/[trialId]": { permission: "lab.read", empty: 200 },
  "PATCH /api/trials/[trialId]": { permission: "trials.write", empty: 200, foreign: () => ({ hypothesis: "changed by an outsider" }) },
  "POST /api/trials/[trialId]/start": { permission: "trials.write", empty: 409, foreign: () => ({}) },
  "GET /api/trials": { permission: "lab.read", empty: 200 },
  // Another lab's chambers and treatments in a new trial of the caller's lab: invalid input.
  "POST /api/trials": { permission: "trials.write", empty: 422, foreign: (f) => ({ title: "Cross-lab trial", question: "Can another lab's rows be used here?", chamberIds: [f.chamberId], treatmentIds: [f.treatmentId], replicatesPerArm: 1, plan: { kind: "custom", days: [0, 7] } }), foreignAnswer: "invalid" },
};
