// The team fields of a trial, in one table: who may change each field, and what a person named in it
// must be able to do in the lab. The trial queries (asked by the server actions and by
// PATCH /api/trials/[trialId]), the Scoring tab and the forms all read this table.
import { AppError } from "@/lib/auth/errors";
import { PERMISSIONS, ROLE_LABELS, can, type Permission, type Role } from "@/lib/auth/permissions";

type TeamField = {
  /** What the field is called in messages. */
  label: string;
  /** The permission needed to change the field. */
  change: Permission;
  /** For fields naming people: the permission each named person needs for the job, and the job in words. */
  person?: { permission: Permission; job: string; as: string };
};

export const TEAM_FIELDS = {
  technicianIds: { label: "technicians", change: "trials.write", person: { permission: "inspections.record", job: "record inspections", as: "a technician" } },
  photoProtocol: { label: "the photo protocol", change: "trials.write" },
  scorers: { label: "scorers and their blind flag", change: "scorers.assign", person: { permission: "scores.write", job: "score", as: "a scorer" } },
  scoreRule: { label: "the score-of-record rule", change: "scorers.assign" },
  primaryScorerId: { label: "the primary scorer", change: "scorers.assign", person: { permission: "scores.write", job: "score", as: "the primary scorer" } },
} as const satisfies Record<string, TeamField>;

export type TeamFieldName = keyof typeof TEAM_FIELDS;
export const TEAM_FIELD_NAMES = Object.keys(TEAM_FIELDS) as TeamFieldName[];
export type PersonField = { [K in TeamFieldName]: (typeof TEAM_FIELDS)[K] extends { person: unknown } ? K : never }[TeamFieldName];

export function isTeamField(key: string): key is TeamFieldName {
  return Object.hasOwn(TEAM_FIELDS, key);
}

/** Per field: may this role change it? (The forms disable what is false.) */
export function teamRights(role: Role | null | undefined): Record<TeamFieldName, boolean> {
  return Object.fromEntries(TEAM_FIELD_NAMES.map((f) => [f, can(role, TEAM_FIELDS[f].change)])) as Record<TeamFieldName, boolean>;
}

/** May a lab member with this role be named in the field (e.g. a scorer must be able to write scores)? */
export function canServeAs(field: PersonField, role: Role | null | undefined): boolean {
  return can(role, TEAM_FIELDS[field].person.permission);
}

function rolesWith(permission: Permission): string {
  return (PERMISSIONS[permission] as readonly Role[]).map((r) => ROLE_LABELS[r].name.toLowerCase()).join(" or ");
}

/** The team fields present (not undefined) in an input. */
export function teamFieldsIn(input: object): TeamFieldName[] {
  return TEAM_FIELD_NAMES.filter((f) => (input as Record<string, unknown>)[f] !== undefined);
}

/** 403 naming every team field in the input that the role may not change; nothing is written before this passes. */
export function assertTeamChange(role: Role, input: object) {
  const refused = teamFieldsIn(input).filter((f) => !can(role, TEAM_FIELDS[f].change));
  if (!refused.length) return;
  const byPermission = new Map<Permission, TeamFieldName[]>();
  for (const f of refused) byPermission.set(TEAM_FIELDS[f].change, [...(byPermission.get(TEAM_FIELDS[f].change) ?? []), f]);
  const sentences = [...byPermission].map(([p, fs]) => `Only a lab ${rolesWith(p)} assigns ${listWords(fs.map((f) => TEAM_FIELDS[f].label))}.`);
  throw new AppError("forbidden", `${sentences.join(" ")} Your role (${role}) does not allow it; nothing was saved.`,
    Object.fromEntries(refused.map((f) => [f, [`Only a lab ${rolesWith(TEAM_FIELDS[f].change)} can change this.`]])));
}

/** A named person who is not a current lab member, or whose role cannot do the job: 422 on that field. */
export function personError(field: PersonField, role: Role | null, formField: string = field): AppError {
  if (!role) {
    return new AppError("invalid", `A person chosen as ${TEAM_FIELDS[field].person.as} is not a member of this lab. Nothing was saved.`, { [formField]: ["Not a member of this lab."] });
  }
  const { job } = TEAM_FIELDS[field].person;
  const who = `${ROLE_LABELS[role].name}s`;
  return new AppError("invalid", `${who} cannot ${job}, so they cannot be chosen as ${TEAM_FIELDS[field].person.as}. Nothing was saved.`,
    { [formField]: [`${who} cannot ${job}; change their role first, or choose lab members with the ${rolesWith(TEAM_FIELDS[field].person.permission)} role.`] });
}

/** The first person named in an input whose membership (role, or null when not a member) does not qualify. */
export function findUnqualified(field: PersonField, userIds: string[], roleOf: Map<string, Role>): { userId: string; role: Role | null } | null {
  for (const userId of userIds) {
    const role = roleOf.get(userId) ?? null;
    if (!canServeAs(field, role)) return { userId, role };
  }
  return null;
}

function listWords(words: string[]): string {
  return words.length <= 1 ? words.join("") : `${words.slice(0, -1).join(", ")} and ${words[words.length - 1]}`;
}
