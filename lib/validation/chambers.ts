// zod schemas for chambers, readings, desiccant upkeep, hygrometer checks and logger tokens. The same
// schemas run in the browser (live feedback) and on the server (the check that counts).
import { z } from "zod";
import { DESICCANTS, INDICATOR_KINDS, type DesiccantKind, type IndicatorKind } from "@/lib/humidity/desiccant";
import { CHAMBER_KINDS, type ChamberKind } from "@/lib/humidity/hazards";
import { isSaltId, saltEquilibriumRh, SALTS, type SaltId } from "@/lib/humidity/salts";
import { parseLocalTime, zoneResolver } from "@/lib/climate/time-parse";

export const CHAMBER_KIND_LABELS: Record<ChamberKind, string> = {
  "saturated-salt": "Saturated salt solution",
  desiccant: "Desiccant",
  water: "Pure water",
  vacuum: "Vacuum",
  "inert-gas": "Inert gas",
  "open-shelf": "Open shelf",
  other: "Other",
};

export const DESICCANT_KINDS = Object.keys(DESICCANTS) as DesiccantKind[];
export const DESICCANT_EVENT_KINDS = ["charged", "regenerated", "replaced", "checked"] as const;
export type DesiccantEventKind = (typeof DESICCANT_EVENT_KINDS)[number];

/** Water jars: a sealed jar approaches 100 %RH but real ones read a few percent lower (common practice). */
export const WATER_DEFAULT_SETPOINT = 96;
export const WATER_DEFAULT_TOLERANCE = 4;
export const DEFAULT_TOLERANCE = 2;
/** Desiccant reminders go out this many days before the projected exhaustion. */
export const REMIND_DAYS_BEFORE = 3;

/** Form text → number or undefined; accepts a decimal comma. Non-numbers stay strings so zod says so. */
function toNumber(v: unknown): unknown {
  if (typeof v !== "string") return v;
  const s = v.trim().replace(",", ".");
  if (s === "") return undefined;
  const n = Number(s);
  return Number.isFinite(n) ? n : v;
}

const numberIn = (label: string, unit: string, min: number, max: number) =>
  z.number(`Enter ${label} as a number.`).min(min, `${capital(label)} must be at least ${min}${unit}.`).max(max, `${capital(label)} must be at most ${max}${unit}.`);
const num = (label: string, unit: string, min: number, max: number) => z.preprocess(toNumber, numberIn(label, unit, min, max));
// Optional inside the preprocess: an empty form field becomes undefined there and must pass.
const optionalNum = (label: string, unit: string, min: number, max: number) => z.preprocess(toNumber, numberIn(label, unit, min, max).optional());
const optionalText = (max: number) => z.preprocess((v) => (typeof v === "string" && v.trim() === "" ? undefined : v), z.string().trim().max(max).optional());

function capital(s: string) {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** Equilibrium RH of a salt at a temperature, or the reason it cannot be given. */
export function saltAt(saltId: SaltId, tempC: number): { ok: true; rhPercent: number; uncertaintyPercent: number | null } | { ok: false; message: string } {
  const [lo, hi] = SALTS[saltId].rangeC;
  if (!Number.isFinite(tempC) || tempC < lo || tempC > hi) {
    return { ok: false, message: `${SALTS[saltId].displayName}: ${SALTS[saltId].fitLabel} covers ${lo}–${hi} °C; enter a temperature in that range.` };
  }
  const eq = saltEquilibriumRh(saltId, tempC);
  return { ok: true, rhPercent: eq.rhPercent, uncertaintyPercent: eq.uncertaintyPercent };
}

export const roundTo = (x: number, digits = 1) => Math.round(x * 10 ** digits) / 10 ** digits;

/** The name of a chamber or storage location (both are chamber rows). */
export const chamberNameField = z.string().trim().min(1, "Name the chamber.").max(120, "Use at most 120 characters.");

const chamberFields = z.object({
  name: chamberNameField,
  kind: z.enum(CHAMBER_KINDS as [ChamberKind, ...ChamberKind[]], "Choose how the humidity is held."),
  saltId: optionalText(20),
  desiccantKind: z.preprocess((v) => (v === "" ? undefined : v), z.enum(DESICCANT_KINDS as [DesiccantKind, ...DesiccantKind[]], "Choose a desiccant.").optional()),
  desiccantMassG: optionalNum("desiccant mass", " g", 0.1, 100_000),
  desiccantIndicator: z.preprocess((v) => (v === "" ? undefined : v), z.enum(INDICATOR_KINDS as [IndicatorKind, ...IndicatorKind[]], "Choose the indicator, or “No indicator”.").optional()),
  nominalTempC: num("temperature", " °C", -40, 100),
  volumeL: optionalNum("volume", " L", 0.01, 100_000),
  setpointRhPercent: optionalNum("setpoint", " %RH", 0, 100),
  toleranceRhPercent: optionalNum("tolerance", " %RH", 0.1, 50),
  roomRhPercent: optionalNum("room RH", " %RH", 0, 100),
  airExchangePerDay: optionalNum("air exchanges per day", "", 0, 1000),
  notes: z.preprocess((v) => v ?? "", z.string().trim().max(4000, "Use at most 4000 characters.")),
});

/**
 * Chamber create/edit. Cross-field rules: a salt chamber needs a salt and a temperature inside that
 * salt's fit range; a desiccant chamber needs its kind and mass. Defaults: the setpoint of a salt
 * chamber is its equilibrium RH at the temperature, a water jar 96 ± 4 %RH.
 */
export const chamberSchema = chamberFields
  .superRefine((v, ctx) => {
    if (v.kind === "saturated-salt") {
      if (!v.saltId || !isSaltId(v.saltId)) {
        ctx.addIssue({ code: "custom", path: ["saltId"], message: "Choose the salt." });
      } else {
        const at = saltAt(v.saltId, v.nominalTempC);
        if (!at.ok) ctx.addIssue({ code: "custom", path: ["nominalTempC"], message: at.message });
      }
    }
    if (v.kind === "desiccant") {
      if (!v.desiccantKind) ctx.addIssue({ code: "custom", path: ["desiccantKind"], message: "Choose the desiccant." });
      if (v.desiccantMassG === undefined) ctx.addIssue({ code: "custom", path: ["desiccantMassG"], message: "Enter the desiccant mass in g." });
      if (v.desiccantKind && !DESICCANTS[v.desiccantKind].takesIndicator && v.desiccantIndicator && v.desiccantIndicator !== "none") {
        ctx.addIssue({ code: "custom", path: ["desiccantIndicator"], message: `${DESICCANTS[v.desiccantKind].displayName} takes no colour indicator here; choose “No indicator”.` });
      }
    }
    if (v.setpointRhPercent === undefined && v.kind !== "saturated-salt" && v.kind !== "water") {
      ctx.addIssue({ code: "custom", path: ["setpointRhPercent"], message: "Enter the target RH in %RH." });
    }
  })
  .transform((v) => {
    const salt = v.kind === "saturated-salt" && v.saltId && isSaltId(v.saltId) ? v.saltId : null;
    let setpoint = v.setpointRhPercent;
    let tolerance = v.toleranceRhPercent;
    if (setpoint === undefined && salt) setpoint = roundTo(saltEquilibriumRh(salt, v.nominalTempC).rhPercent, 1);
    if (v.kind === "water") {
      setpoint ??= WATER_DEFAULT_SETPOINT;
      tolerance ??= WATER_DEFAULT_TOLERANCE;
    }
    const desiccant = v.kind === "desiccant";
    return {
      name: v.name,
      kind: v.kind,
      saltId: salt,
      desiccantKind: desiccant ? (v.desiccantKind ?? null) : null,
      desiccantMassG: desiccant ? (v.desiccantMassG ?? null) : null,
      desiccantIndicator: desiccant && v.desiccantKind && DESICCANTS[v.desiccantKind].takesIndicator ? (v.desiccantIndicator ?? null) : null,
      roomRhPercent: desiccant ? (v.roomRhPercent ?? null) : null,
      airExchangePerDay: desiccant ? (v.airExchangePerDay ?? null) : null,
      nominalTempC: v.nominalTempC,
      volumeL: v.volumeL ?? null,
      setpointRhPercent: setpoint ?? 0,
      toleranceRhPercent: tolerance ?? DEFAULT_TOLERANCE,
      notes: v.notes,
    };
  });
export type ChamberInput = z.output<typeof chamberSchema>;

export const chamberUpdateSchema = z.intersection(z.object({ chamberId: z.uuid() }), chamberSchema);
export const chamberIdSchema = z.object({ chamberId: z.uuid() });
export const archiveSchema = z.object({ chamberId: z.uuid(), archive: z.enum(["0", "1"]) });

/** A wall-clock time from a datetime-local input in the browser's zone (sent along as `timeZone`). */
export function localToInstant(local: string, timeZone: string): Date | null {
  const parsed = parseLocalTime(local.replace("T", " "), "auto");
  if (!parsed) return null;
  try {
    const ms = parsed.offsetMinutes === null ? zoneResolver(timeZone || "UTC").toUtcMs(parsed.wallMs) : parsed.wallMs - parsed.offsetMinutes * 60_000;
    return Number.isFinite(ms) ? new Date(ms) : null;
  } catch {
    return null;
  }
}

const whenText = z.string().trim().min(1, "Enter the date and time.");
const timeZoneField = z.preprocess((v) => (typeof v === "string" && v.trim() !== "" ? v : "UTC"), z.string().trim().max(64));

function checkInstant(local: string, timeZone: string, path: string, ctx: z.RefinementCtx) {
  const at = localToInstant(local, timeZone);
  if (!at) ctx.addIssue({ code: "custom", path: [path], message: "Enter a date and time such as 2025-03-01 14:30." });
  else if (at.getTime() > Date.now() + 5 * 60_000) ctx.addIssue({ code: "custom", path: [path], message: "That time is in the future." });
}

export const manualReadingSchema = z
  .object({
    chamberId: z.uuid(),
    takenAt: whenText,
    timeZone: timeZoneField,
    rhPercent: num("RH", " %RH", 0, 100),
    tempC: optionalNum("temperature", " °C", -60, 90),
    instrument: z.preprocess((v) => (typeof v === "string" && v.trim() !== "" ? v : "manual"), z.string().trim().max(80, "Use at most 80 characters.")),
  })
  .superRefine((v, ctx) => checkInstant(v.takenAt, v.timeZone, "takenAt", ctx))
  .transform((v) => ({ ...v, takenAt: localToInstant(v.takenAt, v.timeZone)! }));

export const desiccantEventSchema = z
  .object({
    chamberId: z.uuid(),
    kind: z.enum(DESICCANT_EVENT_KINDS, "Choose what was done."),
    at: whenText,
    timeZone: timeZoneField,
    massG: optionalNum("mass", " g", 0, 100_000),
    notes: z.preprocess((v) => v ?? "", z.string().trim().max(2000, "Use at most 2000 characters.")),
  })
  .superRefine((v, ctx) => checkInstant(v.at, v.timeZone, "at", ctx))
  .transform((v) => ({ ...v, at: localToInstant(v.at, v.timeZone)! }));

export const hygrometerCheckSchema = z
  .object({
    chamberId: z.uuid(),
    instrument: z.string().trim().min(1, "Name the instrument (as in its readings).").max(80, "Use at most 80 characters."),
    saltId: z.string().refine(isSaltId, "Choose the salt."),
    tempC: num("temperature", " °C", -40, 100),
    readingRhPercent: num("reading", " %RH", 0, 100),
    // Optional second salt of a two-salt check (offset and slope); both or neither.
    salt2Id: z.preprocess((v) => (v === "" || v == null ? undefined : v), z.string().refine(isSaltId, "Choose the second salt.").optional()),
    reading2RhPercent: optionalNum("reading over the second salt", " %RH", 0, 100),
    checkedAt: whenText,
    timeZone: timeZoneField,
    apply: z.preprocess((v) => v === "on" || v === "1" || v === true, z.boolean()),
    notes: z.preprocess((v) => v ?? "", z.string().trim().max(2000)),
  })
  .superRefine((v, ctx) => {
    if (isSaltId(v.saltId)) {
      const at = saltAt(v.saltId, v.tempC);
      if (!at.ok) ctx.addIssue({ code: "custom", path: ["tempC"], message: at.message });
    }
    checkSecondSalt(v, ctx);
    checkInstant(v.checkedAt, v.timeZone, "checkedAt", ctx);
  })
  .transform((v) => ({ ...v, saltId: v.saltId as SaltId, salt2Id: v.salt2Id as SaltId | undefined, checkedAt: localToInstant(v.checkedAt, v.timeZone)! }));

/** A two-salt check needs a second, different salt valid at the temperature, a reading over it, and a rising response. */
function checkSecondSalt(v: { saltId: string; salt2Id?: string; tempC: number; readingRhPercent: number; reading2RhPercent?: number }, ctx: z.RefinementCtx) {
  if (v.salt2Id === undefined && v.reading2RhPercent === undefined) return;
  if (v.salt2Id === undefined) return ctx.addIssue({ code: "custom", path: ["salt2Id"], message: "Choose the second salt, or clear its reading for a one-salt check." });
  if (v.reading2RhPercent === undefined) return ctx.addIssue({ code: "custom", path: ["reading2RhPercent"], message: "Enter the reading over the second salt." });
  if (v.salt2Id === v.saltId) return ctx.addIssue({ code: "custom", path: ["salt2Id"], message: "A two-salt check needs two different salts: choose another second salt." });
  if (!isSaltId(v.saltId) || !isSaltId(v.salt2Id)) return;
  const a = saltAt(v.saltId, v.tempC);
  const b = saltAt(v.salt2Id, v.tempC);
  if (!b.ok) return ctx.addIssue({ code: "custom", path: ["salt2Id"], message: b.message });
  if (a.ok && !((v.reading2RhPercent - v.readingRhPercent) / (b.rhPercent - a.rhPercent) > 0)) {
    ctx.addIssue({ code: "custom", path: ["reading2RhPercent"], message: "The reading over the wetter salt must be higher than over the drier one; check the two readings." });
  }
}

export const checkAppliedSchema = z.object({ chamberId: z.uuid(), checkId: z.uuid(), applied: z.enum(["0", "1"]) });

export const createTokenSchema = z.object({ chamberId: z.uuid(), label: z.string().trim().min(1, "Give the token a label, e.g. the logger's name.").max(80, "Use at most 80 characters.") });
export const revokeTokenSchema = z.object({ chamberId: z.uuid(), tokenId: z.uuid() });

// ——— Logger API (JSON) ———
export const MAX_API_READINGS = 5000;

export const apiReadingSchema = z.strictObject({
  takenAt: z.iso.datetime({ offset: true, message: "takenAt must be an ISO 8601 time with a zone, e.g. 2025-03-01T14:30:00Z." }),
  rhPercent: z.number("rhPercent must be a number.").min(0, "rhPercent must be 0–100.").max(100, "rhPercent must be 0–100."),
  tempC: z.number("tempC must be a number.").min(-60, "tempC must be −60…90.").max(90, "tempC must be −60…90.").nullish(),
  dewPointC: z.number("dewPointC must be a number.").min(-90, "dewPointC must be −90…90.").max(90, "dewPointC must be −90…90.").nullish(),
  instrument: z.string().trim().min(1).max(80, "instrument must be at most 80 characters.").optional(),
});
export type ApiReading = z.infer<typeof apiReadingSchema>;

/** One reading or an array of 1–5000. */
export const apiReadingsBodySchema = z.preprocess(
  (v) => (Array.isArray(v) ? v : [v]),
  z.array(apiReadingSchema).min(1, "Send at least one reading.").max(MAX_API_READINGS, `Send at most ${MAX_API_READINGS} readings per request.`),
);

// ——— CSV import options (sent with the file) ———
const colRef = z.union([z.number().int().min(0), z.string().min(1).max(200)]);
export const csvImportOptionsSchema = z.object({
  instrument: z.string().trim().min(1, "Name the logger (readings are kept per instrument).").max(80),
  mapping: z.object({
    time: z.union([colRef, z.tuple([colRef, colRef])]),
    rhPercent: colRef,
    tempC: colRef.nullish(),
    dewPointC: colRef.nullish(),
  }),
  delimiter: z.enum(["auto", ",", ";", "\t"]).default("auto"),
  skipLines: z.number().int().min(0).max(1000).default(0),
  hasHeader: z.boolean().default(true),
  // Without a zone, the one the time column's header states ("Date Time, GMT+01:00"), else UTC (importCsv).
  timeZone: z.string().trim().min(1).max(64).optional(),
  temperatureUnit: z.enum(["C", "F"]).default("C"),
  dateFormat: z.enum(["auto", "iso", "ymd", "dmy", "mdy"]).default("auto"),
});
export type CsvImportOptionsInput = z.infer<typeof csvImportOptionsSchema>;

export const PERIODS = ["7d", "30d", "all"] as const;
export type Period = (typeof PERIODS)[number];
export function parsePeriod(v: string | undefined): Period {
  return (PERIODS as readonly string[]).includes(v ?? "") ? (v as Period) : "30d";
}
