// The one permission map. Server actions and route handlers name one of these; the UI may hide
// buttons with `can()`, but the server check is what counts.
export const ROLES = ["lead", "researcher", "technician", "observer"] as const;
export type Role = (typeof ROLES)[number];

const ALL: Role[] = ["lead", "researcher", "technician", "observer"];
const STAFF: Role[] = ["lead", "researcher", "technician"];
const DESIGN: Role[] = ["lead", "researcher"];

export const PERMISSIONS = {
  "lab.read": ALL,
  "audit.read": ALL,
  "analysis.read": ALL,
  "export.read": ALL,
  "members.manage": ["lead"],
  "chambers.write": DESIGN,
  "chambers.tokens": DESIGN,
  "readings.write": STAFF,
  "desiccant.write": STAFF,
  "specimens.write": DESIGN,
  // Bench measurements in a specimen's history — weighings, chloride tests, akaganeite checks — are
  // recorded (and corrected) by whoever makes them, technicians too; earlier treatments stay with
  // specimens.write (lib/validation/specimen-history historyPermission).
  "history.record": STAFF,
  "treatments.write": DESIGN,
  "trials.write": DESIGN,
  "trials.conclude": ["lead"],
  "trials.notes": STAFF,
  "scorers.assign": ["lead"],
  "inspections.record": STAFF,
  "inspections.reschedule": DESIGN,
  "photos.upload": STAFF,
  "photos.gps": STAFF,
  "scores.write": STAFF,
  // Recording the agreed score after scorers discussed a disagreement (trials with the consensus rule).
  "scores.consensus": DESIGN,
  // Moving collection objects between storage locations (done at the shelf, so technicians too).
  "collection.move": STAFF,
  // A storage rule is the lab's policy for its collection: the lead accepts it.
  "storageRules.accept": ["lead"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function can(role: Role | null | undefined, permission: Permission): boolean {
  return !!role && (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

export const ROLE_LABELS: Record<Role, { name: string; summary: string }> = {
  lead: { name: "Lead", summary: "Everything, including members, scorer assignment and concluding trials" },
  researcher: { name: "Researcher", summary: "Designs trials, chambers, specimens and treatments; runs analysis" },
  technician: { name: "Technician", summary: "Records inspections, photos, scores, readings, weighings and tests, desiccant upkeep and object moves" },
  observer: { name: "Observer", summary: "Reads everything except photo locations; changes nothing" },
};
