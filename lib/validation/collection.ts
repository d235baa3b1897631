// zod schemas for storage locations (a chamber with a place in the collection tree) and object moves.
import { z } from "zod";
import { STORAGE_KINDS } from "@/lib/collection/locations";
import { chamberNameField, chamberSchema, localToInstant } from "./chambers";

const optionalId = (message: string) => z.preprocess((v) => (v === "" || v === null ? undefined : v), z.uuid(message).optional());

const emptyToUndefined = (v: unknown) => (v === "" || v == null ? undefined : v);
const alertAfterHours = z.coerce.number({ error: "Enter the alert delay in hours." })
  .min(0.5, "The alert delay must be at least 0.5 h.").max(720, "The alert delay must be at most 720 h (30 days).");

const placeFields = z.object({
  locationKind: z.enum(STORAGE_KINDS, "Choose what kind of place this is."),
  parentId: optionalId("Choose the location this one sits in, or none."),
  keeperId: optionalId("Choose the keeper from the lab's members."),
  // Left empty on a new location: the default 6 h.
  alertAfterHours: z.preprocess(emptyToUndefined, alertAfterHours.default(6)),
});

/** A storage location: the chamber fields (how its humidity is held = its microclimate) and its place. */
export const locationSchema = z.intersection(placeFields, chamberSchema);
export type LocationInput = z.output<typeof locationSchema>;

/**
 * A storage location's settings edited after creation: name, kind of place, keeper (none when empty) and
 * alert delay, with the same field rules as a new location; the delay is required here (no silent default).
 * The place in the tree is reparentSchema's; the microclimate and target are the chamber edit form's.
 */
export const locationSettingsSchema = z.object({
  locationId: z.uuid("Choose the location."),
  name: chamberNameField,
  locationKind: placeFields.shape.locationKind,
  keeperId: placeFields.shape.keeperId,
  alertAfterHours: z.preprocess(emptyToUndefined, alertAfterHours),
}).transform((v) => ({ ...v, keeperId: v.keeperId ?? null }));
export type LocationSettingsInput = z.output<typeof locationSettingsSchema>;

/** Only the place in the tree (parent), as the tree's "move into" form sends it. */
export const reparentSchema = z.object({ locationId: z.uuid(), parentId: optionalId("Choose the location this one sits in, or none.") });

export const moveObjectSchema = z
  .object({
    specimenId: z.uuid("Choose the object."),
    locationId: z.uuid("Choose where the object goes."),
    at: z.string().trim().min(1, "Enter the date and time of the move."),
    timeZone: z.preprocess((v) => (typeof v === "string" && v.trim() !== "" ? v : "UTC"), z.string().trim().max(64)),
    reason: z.preprocess((v) => v ?? "", z.string().trim().max(500, "Use at most 500 characters.")),
  })
  .superRefine((v, ctx) => {
    if (v.at && !localToInstant(v.at, v.timeZone)) ctx.addIssue({ code: "custom", path: ["at"], message: "Enter a date and time such as 2025-03-01 14:30." });
  })
  .transform((v) => ({ specimenId: v.specimenId, locationId: v.locationId, at: localToInstant(v.at, v.timeZone)!, reason: v.reason }));
export type MoveObjectInput = z.output<typeof moveObjectSchema>;

const overviewShareSchema = z.coerce.number().min(0).max(100);

/** The overview's share (% of the last 30 days out of rule) from the URL: a bad value falls back to the default, with a sentence saying so. */
export function overviewShare(raw: string | undefined, fallback: number): { share: number; problem: string | null } {
  if (raw === undefined || raw === "") return { share: fallback, problem: null };
  const parsed = overviewShareSchema.safeParse(raw);
  if (!parsed.success) return { share: fallback, problem: `The share must be a number from 0 to 100 %; showing ${+(fallback * 100).toFixed(2)} %.` };
  return { share: parsed.data / 100, problem: null };
}
