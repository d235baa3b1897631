// Input for a specimen's history entries (one form per kind on the specimen page, one action).
// The method lists here are the ones the database checks (db/schema/specimen-history.ts).
import type { Permission } from "@/lib/auth/permissions";
import { z } from "zod";
import { latestToday, massToTenthMg } from "@/lib/specimens/history";

export const CHLORIDE_METHODS = ["silver-nitrate-spot", "chloride-strip", "ion-chromatography", "titration", "other"] as const;
export const CHLORIDE_METHOD_LABELS: Record<(typeof CHLORIDE_METHODS)[number], string> = {
  "silver-nitrate-spot": "Silver nitrate spot test on a swab or wash water",
  "chloride-strip": "Chloride test strip on wash water",
  "ion-chromatography": "Ion chromatography of wash water",
  titration: "Titration of wash water",
  other: "Other (say which in the notes)",
};
export const CHLORIDE_RESULTS = ["present", "absent", "inconclusive"] as const;
export const AKAGANEITE_METHODS = ["visual", "microscope", "raman", "xrd", "other"] as const;
export const AKAGANEITE_METHOD_LABELS: Record<(typeof AKAGANEITE_METHODS)[number], string> = {
  visual: "By eye (orange-brown powder, weeping droplets)", microscope: "Stereo microscope", raman: "Raman spectroscopy", xrd: "X-ray diffraction", other: "Other (say which in the notes)",
};
export const MASS_UNITS = ["g", "mg"] as const;

const notes = z.string().trim().max(2000, "Notes: use at most 2000 characters.").default("");

/** A calendar date, not after today (see latestToday). */
const pastDate = (what: string) => z.string({ error: `Give the ${what} date.` }).trim()
  .regex(/^\d{4}-\d{2}-\d{2}$/, `Give the ${what} date as YYYY-MM-DD.`)
  .refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)) && new Date(`${d}T00:00:00Z`).toISOString().startsWith(d), `The ${what} date is not a real date.`)
  .refine((d) => d >= "1800-01-01", `The ${what} date must be in 1800 or later.`)
  .refine((d) => d <= latestToday(), `The ${what} date is in the future; enter the day it was done.`);

const base = { specimenId: z.uuid("Choose a specimen."), notes };

const chloride = z.object({
  ...base, kind: z.literal("chloride"), testedOn: pastDate("test"),
  method: z.enum(CHLORIDE_METHODS, `Choose a method: ${CHLORIDE_METHODS.join(", ")}.`),
  result: z.enum(CHLORIDE_RESULTS, "Choose a result: present, absent or inconclusive."),
});
const akaganeite = z.object({
  ...base, kind: z.literal("akaganeite"), checkedOn: pastDate("check"),
  method: z.enum(AKAGANEITE_METHODS, `Choose a method: ${AKAGANEITE_METHODS.join(", ")}.`),
  seen: z.enum(["yes", "no"], "Say whether akaganeite was seen: yes or no."),
});
const treatment = z.object({
  ...base, kind: z.literal("treatment"), treatedOn: pastDate("treatment"),
  treatment: z.string().trim().min(1, "Say what was done, e.g. alkaline sulphite wash.").max(300, "Treatment: use at most 300 characters."),
});
const mass = z.object({
  ...base, kind: z.literal("mass"), measuredOn: pastDate("weighing"),
  mass: z.string({ error: "Give the mass." }).trim().min(1, "Give the mass.")
    .regex(/^\d+(\.\d+)?$/, "Give the mass as a number only (e.g. 12.3456) and choose its unit, g or mg."),
  unit: z.enum(MASS_UNITS, "Choose the unit of the mass: g or mg."),
}).superRefine((v, ctx) => {
  const tenths = massToTenthMg(v.mass, v.unit);
  if (tenths === null) ctx.addIssue({ code: "custom", path: ["mass"], message: `Give the mass to 0.1 mg at most (${v.unit === "g" ? "4 decimals in g" : "1 decimal in mg"}).` });
  else if (tenths <= 0) ctx.addIssue({ code: "custom", path: ["mass"], message: "The mass must be above 0." });
  else if (tenths >= 1_000_000_000) ctx.addIssue({ code: "custom", path: ["mass"], message: "The mass must be below 100 kg." });
});

export const HISTORY_KINDS = ["chloride", "akaganeite", "treatment", "mass"] as const;
export type HistoryKind = (typeof HISTORY_KINDS)[number];

/** Who may record, correct or delete an entry of this kind: bench measurements are staff work; an earlier treatment is the specimen's record. */
export const historyPermission = (kind: HistoryKind): Permission => (kind === "treatment" ? "specimens.write" : "history.record");
export const historyEntrySchema = z.discriminatedUnion("kind", [chloride, akaganeite, treatment, mass], { error: "Choose what to record." });
export type HistoryEntryInput = z.infer<typeof historyEntrySchema>;

/** Correcting a wrong entry: the same fields as a new one, plus the entry's id (its kind cannot change). */
export const historyEntryEditSchema = z.discriminatedUnion("kind", [
  chloride.extend({ entryId: z.uuid("No such entry.") }),
  akaganeite.extend({ entryId: z.uuid("No such entry.") }),
  treatment.extend({ entryId: z.uuid("No such entry.") }),
  mass.safeExtend({ entryId: z.uuid("No such entry.") }),
], { error: "Choose what to record." });
export type HistoryEntryEditInput = z.infer<typeof historyEntryEditSchema>;

/** Deleting a wrong entry: which one, and why (kept in the audit trail). */
export const historyEntryDeleteSchema = z.object({
  specimenId: z.uuid("Choose a specimen."),
  kind: z.enum(HISTORY_KINDS, "Choose what to delete."),
  entryId: z.uuid("No such entry."),
  reason: z.string({ error: "Say why this entry is deleted." }).trim().min(3, "Say why this entry is deleted (at least 3 characters).").max(500, "Reason: use at most 500 characters."),
});
export type HistoryEntryDeleteInput = z.infer<typeof historyEntryDeleteSchema>;
