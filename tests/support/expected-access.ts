// What the product promises about access, written by hand from what each role is for (README "Demo
// logins" and ROLE_LABELS' summaries), NOT read from lib/auth/permissions.ts: the authorization matrix
// and the page-access test compare the code against these tables, so a changed permission fails a test.
import type { Permission, Role } from "@/lib/auth/permissions";

const READ: Permission[] = ["lab.read", "audit.read", "analysis.read", "export.read"];
// Technicians: inspections, photos (with their locations), scores, readings, desiccant upkeep, trial notes,
// moving collection objects between storage locations, recording bench measurements in a specimen's history.
const BENCH: Permission[] = ["readings.write", "desiccant.write", "inspections.record", "photos.upload", "photos.gps", "scores.write", "trials.notes", "collection.move", "history.record"];
// Researchers: design trials, chambers (and their logger tokens), specimens, treatments; move inspections;
// record the agreed score after scorers discussed a disagreement.
const DESIGN: Permission[] = ["chambers.write", "chambers.tokens", "specimens.write", "treatments.write", "trials.write", "inspections.reschedule", "scores.consensus"];
// Lead: everything, including members, scorer assignment, concluding trials and accepting the lab's storage rules.
const LEAD: Permission[] = ["members.manage", "scorers.assign", "trials.conclude", "storageRules.accept"];

export const ROLE_PERMISSIONS: Record<Role, readonly Permission[]> = {
  lead: [...READ, ...BENCH, ...DESIGN, ...LEAD],
  researcher: [...READ, ...BENCH, ...DESIGN],
  technician: [...READ, ...BENCH],
  // Reads everything except photo locations; changes nothing.
  observer: READ,
};

export function expectedRoles(permission: Permission): Role[] {
  return (Object.keys(ROLE_PERMISSIONS) as Role[]).filter((r) => ROLE_PERMISSIONS[r].includes(permission));
}

/** The permission each page under app/(lab) needs, by route pattern. */
export const PAGE_PERMISSIONS: Record<string, Permission> = {
  "/": "lab.read",
  "/analysis": "analysis.read",
  "/audit": "audit.read",
  "/chambers": "lab.read",
  "/collection": "lab.read",
  "/collection/overview": "lab.read",
  "/collection/report": "lab.read",
  "/chambers/new": "chambers.write",
  "/chambers/[chamberId]": "lab.read",
  "/chambers/[chamberId]/edit": "chambers.write",
  "/chambers/[chamberId]/import": "readings.write",
  "/chambers/[chamberId]/tokens": "chambers.tokens",
  "/due": "lab.read",
  "/mailbox": "members.manage",
  "/settings": "lab.read",
  "/specimens": "lab.read",
  "/storage-rules": "lab.read",
  "/specimens/new": "specimens.write",
  "/specimens/import": "specimens.write",
  "/specimens/[specimenId]": "lab.read",
  "/specimens/[specimenId]/edit": "specimens.write",
  "/specimens/[specimenId]/timeline": "lab.read",
  "/treatments": "lab.read",
  "/treatments/new": "treatments.write",
  "/treatments/[treatmentId]": "lab.read",
  "/trials": "lab.read",
  "/trials/new": "trials.write",
  "/trials/[trialId]": "lab.read",
  "/trials/[trialId]/edit": "trials.write",
  "/trials/[trialId]/allocation": "lab.read",
  "/trials/[trialId]/schedule": "lab.read",
  "/trials/[trialId]/grid": "lab.read",
  "/trials/[trialId]/scoring": "lab.read",
  "/trials/[trialId]/scoring/[photoId]": "scores.write",
  "/trials/[trialId]/align/[photoId]": "photos.upload",
  "/trials/[trialId]/agreement": "analysis.read",
  "/trials/[trialId]/compare": "analysis.read",
  "/trials/[trialId]/humidity": "analysis.read",
  "/trials/[trialId]/report": "analysis.read",
  "/trials/[trialId]/inspections/[inspectionId]": "lab.read",
  "/trials/[trialId]/inspections/[inspectionId]/photos": "lab.read",
  "/trials/[trialId]/inspections/[inspectionId]/score": "lab.read",
  "/trials/[trialId]/inspections/[inspectionId]/score/[specimenId]": "lab.read",
};
