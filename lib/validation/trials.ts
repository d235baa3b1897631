// Trial design, allocation, status changes, placements and inspections: one schema per input, the
// same for the HTML forms (through a small form-to-object step) and the JSON API.
import { z } from "zod";
import { planDays, type InspectionPlan } from "@/lib/schedule/plans";

export const PRIMARY_OUTCOMES = {
  "time-to-first-rust": "Time to first rust",
  "rusted-area-growth": "Growth of rusted area (%)",
  "final-rust-grade": "Rust grade at the last inspection (ASTM D610)",
  "time-to-weeping": "Time to first weeping",
} as const;
export type PrimaryOutcome = keyof typeof PRIMARY_OUTCOMES;

// Common practice for comparable corrosion photographs; each lab edits these per trial.
export const DEFAULT_PHOTO_PROTOCOL = [
  "Lighting: the same diffuse light from two sides at about 45°, no flash.",
  "Distance: the same camera, lens and distance for every photo of the series.",
  "Scale bar in every frame, in the plane of the cut face.",
  "Colour reference: a grey or colour reference card in every frame.",
  "Photograph promptly after opening the jar and close it again straight away.",
];

export const SCORE_RULES = { "primary-scorer": "Primary scorer's score is the record", consensus: "Consensus of the scorers is the record" } as const;

const uuidList = (what: string, max: number) => z.array(z.uuid(`Unknown ${what}.`)).max(max, `Choose at most ${max} ${what}s.`);

export const planSchema = z
  .discriminatedUnion("kind", [
    z.object({ kind: z.literal("fixed"), intervalDays: z.coerce.number().int("Whole days only.").min(1, "At least 1 day."), count: z.coerce.number().int().min(1, "At least 1 inspection.") }),
    z.object({ kind: z.literal("geometric"), count: z.coerce.number().int().min(1, "At least 1 inspection.") }),
    z.object({ kind: z.literal("custom"), days: z.array(z.coerce.number().int("Whole days only.")).min(1, "List at least one day.") }),
  ], "Choose an inspection plan.")
  .superRefine((plan, ctx) => {
    try {
      planDays(plan as InspectionPlan);
    } catch (err) {
      ctx.addIssue({ code: "custom", message: err instanceof Error ? err.message : "This plan is not valid." });
    }
  });

const protocolLines = z.array(z.string().trim().min(1).max(300, "Keep each line under 300 characters.")).max(30, "At most 30 lines.");

export const scorerSchema = z.object({ userId: z.uuid(), blind: z.boolean().default(false) });

export const trialDesignObject = z.object({
  title: z.string().trim().min(3, "Give the trial a title (at least 3 characters).").max(200, "Use at most 200 characters."),
  question: z.string().trim().min(10, "State the question the trial answers (at least 10 characters).").max(2000, "Use at most 2000 characters."),
  hypothesis: z.string().trim().max(2000, "Use at most 2000 characters.").default(""),
  primaryOutcome: z.enum(Object.keys(PRIMARY_OUTCOMES) as [PrimaryOutcome, ...PrimaryOutcome[]]).default("time-to-first-rust"),
  chamberIds: uuidList("chamber", 12).min(1, "Pick at least one chamber."),
  treatmentIds: uuidList("treatment", 12).min(1, "Pick at least one treatment (a control counts)."),
  replicatesPerArm: z.coerce.number("Enter a number.").int("Whole specimens only.").min(1, "At least 1 specimen per arm.").max(100, "At most 100 per arm."),
  technicianIds: uuidList("technician", 50).default([]),
  photoProtocol: protocolLines.default([]),
  plan: planSchema,
  // Scorer assignment needs scorers.assign (lead); undefined leaves the current assignment alone.
  scorers: z.array(scorerSchema).max(20).optional(),
  scoreRule: z.enum(["primary-scorer", "consensus"]).optional(),
  primaryScorerId: z.uuid().nullable().optional(),
});

function designChecks(d: Partial<z.infer<typeof trialDesignObject>>, ctx: z.RefinementCtx) {
  if (d.chamberIds && d.treatmentIds && d.chamberIds.length * d.treatmentIds.length > 60) ctx.addIssue({ code: "custom", path: ["treatmentIds"], message: "At most 60 arms (chambers × treatments)." });
  if (d.scorers && d.primaryScorerId && !d.scorers.some((s) => s.userId === d.primaryScorerId)) {
    ctx.addIssue({ code: "custom", path: ["primaryScorerId"], message: "The primary scorer must be one of the scorers." });
  }
  if (d.scorers && d.scoreRule === "primary-scorer" && d.scorers.length > 0 && !d.primaryScorerId) {
    ctx.addIssue({ code: "custom", path: ["primaryScorerId"], message: "Choose the primary scorer, or use consensus." });
  }
}
export const trialDesignSchema = trialDesignObject.superRefine(designChecks);
/** JSON PATCH: any subset of the design; no defaults filled in, so absent fields stay as they are. */
const patchShape = Object.fromEntries(Object.entries(trialDesignObject.shape).map(([k, v]) => [k, (v instanceof z.ZodDefault ? v.removeDefault() : v).optional()]));
export const trialPatchSchema = z.object(patchShape).strict().superRefine(designChecks) as unknown as z.ZodType<Partial<z.infer<typeof trialDesignObject>>>;
export type TrialDesign = z.infer<typeof trialDesignSchema>;

/** Repeated form keys ("x[]") become arrays; absent ones empty arrays. */
function list(r: Record<string, unknown>, key: string): string[] {
  const v = r[`${key}[]`] ?? r[key];
  return ([] as unknown[]).concat(v ?? []).filter((x): x is string => typeof x === "string" && x.trim() !== "");
}

/** Custom days typed as "0, 3, 7 14" → numbers (sorted and de-duplicated later by the plan check). */
export function parseDayList(text: string): number[] {
  return text.split(/[\s,;]+/).filter(Boolean).map((t) => (/^\d+$/.test(t) ? Number(t) : Number.NaN));
}

export function planFromFields(r: Record<string, unknown>): unknown {
  switch (r.planKind) {
    case "fixed": return { kind: "fixed", intervalDays: r.intervalDays, count: r.fixedCount };
    case "geometric": return { kind: "geometric", count: r.geometricCount };
    case "custom": return { kind: "custom", days: parseDayList(String(r.customDays ?? "")) };
    default: return undefined;
  }
}

function designFromForm(raw: unknown): unknown {
  if (typeof raw !== "object" || raw === null) return raw;
  const r = raw as Record<string, unknown>;
  const out: Record<string, unknown> = {
    ...r,
    chamberIds: list(r, "chamberIds"),
    treatmentIds: list(r, "treatmentIds"),
    technicianIds: list(r, "technicianIds"),
    photoProtocol: list(r, "photoProtocol").map((l) => l.trim()),
    plan: r.plan ?? planFromFields(r),
  };
  if (r.scorersIncluded === "1") {
    const blind = new Set(list(r, "blindScorerIds"));
    out.scorers = list(r, "scorerIds").map((userId) => ({ userId, blind: blind.has(userId) }));
    out.primaryScorerId = typeof r.primaryScorerId === "string" && r.primaryScorerId ? r.primaryScorerId : null;
  } else {
    delete out.scorers;
    delete out.scoreRule;
    delete out.primaryScorerId;
  }
  return out;
}

export const trialFormSchema = z.preprocess(designFromForm, trialDesignSchema);
export const trialEditFormSchema = z.preprocess(designFromForm, z.intersection(z.object({ trialId: z.uuid() }), trialDesignSchema));

/** Times typed in forms are UTC wall-clock times ("2026-12-02T09:00"), as every page shows UTC. */
export const utcDateTime = z.preprocess((v) => {
  if (v instanceof Date) return v;
  if (typeof v !== "string" || v.trim() === "") return v;
  const s = v.trim();
  return new Date(/[zZ]|[+-]\d\d:?\d\d$/.test(s) ? s : `${s}Z`);
}, z.date("Enter a date and time (UTC).").refine((d) => !Number.isNaN(d.getTime()), "Enter a valid date and time (UTC)."));
const optionalDateTime = z.preprocess((v) => (v === "" || v == null ? undefined : v), utcDateTime.optional());

const reason = z.string().trim().min(5, "Give a reason (at least 5 characters); it goes into the audit trail.").max(1000, "Use at most 1000 characters.");
const trialId = z.uuid("Unknown trial.");

/** Specimen-history blocking factors offered beside the material class (lib/allocation/allocate.ts). */
export const HISTORY_BLOCK_FACTORS = ["parentPiece", "chlorideState"] as const;
export const historyBlockFactors = z.array(z.enum(HISTORY_BLOCK_FACTORS, "Block by parent piece or chloride test result only.")).max(2).default([]);

export const allocationSchema = z.preprocess((raw) => {
  if (typeof raw !== "object" || raw === null) return raw;
  const r = raw as Record<string, unknown>;
  return { ...r, specimenIds: Array.isArray(r.specimenIds) ? r.specimenIds : list(r, "specimenIds"), blockByMaterial: r.blockByMaterial === true || r.blockByMaterial === "on" || r.blockByMaterial === "1",
    blockFactors: Array.isArray(r.blockFactors) ? r.blockFactors : list(r, "blockFactors") };
}, z.object({
  trialId,
  specimenIds: z.array(z.uuid()).min(1, "Choose the specimens to allocate.").max(5000, "At most 5000 specimens."),
  seed: z.string().trim().min(1, "Enter a seed (any word or number).").max(100, "Use at most 100 characters."),
  blockByMaterial: z.boolean(),
  blockFactors: historyBlockFactors,
}));

export const swapSchema = z.object({ trialId, specimenA: z.uuid("Choose the first specimen."), specimenB: z.uuid("Choose the second specimen."), reason })
  .refine((d) => d.specimenA !== d.specimenB, { path: ["specimenB"], message: "Choose two different specimens." });

export const startSchema = z.object({ trialId, startAt: optionalDateTime });
export const concludeSchema = z.object({ trialId, note: z.string().trim().max(5000).default("") });
export const noteSchema = z.object({ trialId, body: z.string().trim().min(1, "Write the note first.").max(5000, "Use at most 5000 characters.") });
export const moveSchema = z.object({
  trialId,
  specimenId: z.uuid("Choose a specimen."),
  // Empty: take the specimen out of the trial without placing it elsewhere.
  armId: z.union([z.uuid(), z.literal("")]).default(""),
  at: optionalDateTime,
  reason,
});
export const scorersSchema = z.preprocess(designFromForm, z.object({
  trialId,
  scorers: z.array(scorerSchema).max(20),
  scoreRule: z.enum(["primary-scorer", "consensus"]),
  primaryScorerId: z.uuid().nullable(),
}).superRefine((d, ctx) => {
  if (d.primaryScorerId && !d.scorers.some((s) => s.userId === d.primaryScorerId)) ctx.addIssue({ code: "custom", path: ["primaryScorerId"], message: "The primary scorer must be one of the scorers." });
  if (d.scoreRule === "primary-scorer" && d.scorers.length > 0 && !d.primaryScorerId) ctx.addIssue({ code: "custom", path: ["primaryScorerId"], message: "Choose the primary scorer, or use consensus." });
}));
export const techniciansSchema = z.preprocess(designFromForm, z.object({ trialId, technicianIds: uuidList("technician", 50) }));
export const protocolSchema = z.preprocess(designFromForm, z.object({ trialId, photoProtocol: protocolLines }));

export const recordInspectionSchema = z.object({ inspectionId: z.uuid(), doneAt: optionalDateTime, notes: z.string().trim().max(5000, "Use at most 5000 characters.").default("") });
export const rescheduleSchema = z.object({ inspectionId: z.uuid(), plannedAt: utcDateTime, reason });

export const INSPECTION_STATUSES = ["open", "done", "overdue", "all"] as const;
export const inspectionListSchema = z.object({
  trialId: z.uuid().optional().catch(undefined),
  status: z.enum(INSPECTION_STATUSES).catch("all"),
  before: optionalDateTime.catch(undefined),
  page: z.coerce.number().int().min(1).max(100_000).catch(1),
  pageSize: z.coerce.number().int().min(1).max(500).catch(50),
});

export const TRIAL_STATUSES = ["draft", "running", "concluded"] as const;
export const trialListSchema = z.object({
  status: z.enum(TRIAL_STATUSES).optional().catch(undefined),
  q: z.string().trim().max(100).optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(100_000).catch(1),
  pageSize: z.coerce.number().int().min(1).max(200).catch(25),
});
