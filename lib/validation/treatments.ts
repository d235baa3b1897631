// Treatment input: one base schema for the form and the JSON API.
import { z } from "zod";

export const TREATMENT_KINDS = ["control", "coating", "cleaning", "chloride-removal", "storage-atmosphere", "other"] as const;
export type TreatmentKind = (typeof TREATMENT_KINDS)[number];
export const TREATMENT_KIND_LABELS: Record<TreatmentKind, string> = {
  control: "Control (untreated)",
  coating: "Coating",
  cleaning: "Cleaning",
  "chloride-removal": "Chloride removal",
  "storage-atmosphere": "Storage atmosphere",
  other: "Other",
};

export const treatmentSchema = z.object({
  name: z.string().trim().min(2, "Name the treatment (at least 2 characters).").max(120, "Use at most 120 characters."),
  kind: z.enum(TREATMENT_KINDS, "Choose a kind."),
  description: z.string().trim().max(4000, "Use at most 4000 characters.").default(""),
  protocol: z.string().trim().max(20_000, "Use at most 20,000 characters.").default(""),
});
export type TreatmentInput = z.infer<typeof treatmentSchema>;
export const treatmentUpdateSchema = treatmentSchema.partial();
export const treatmentEditFormSchema = treatmentSchema.extend({ treatmentId: z.uuid() });

export const treatmentListSchema = z.object({
  q: z.string().trim().max(100).optional().catch(undefined),
  kind: z.enum(TREATMENT_KINDS).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(100_000).catch(1),
  pageSize: z.coerce.number().int().min(1).max(500).catch(50),
});
