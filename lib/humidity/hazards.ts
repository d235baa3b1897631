// Hazard notes shown beside a chamber. GHS codes come from the salt and desiccant references;
// the practice cautions are common lab practice (trade practice, not a cited source). We never stand in
// for the safety data sheet, so every result ends with the same deferral.

import { DESICCANTS, GENERAL_DESICCANT_CAUTION, type DesiccantKind } from "@/lib/humidity/desiccant";
import { ghsStatements, type GhsStatement } from "@/lib/humidity/ghs";
import { SALTS, type SaltId } from "@/lib/humidity/salts";

export type ChamberKind = "saturated-salt" | "desiccant" | "water" | "vacuum" | "inert-gas" | "open-shelf" | "other";

export const CHAMBER_KINDS: readonly ChamberKind[] = [
  "saturated-salt",
  "desiccant",
  "water",
  "vacuum",
  "inert-gas",
  "open-shelf",
  "other",
];

export const SDS_DEFERRAL = "Follow the supplier's safety data sheet (SDS) and local rules.";

export const WATER_CHAMBER_NOTE =
  "A sealed jar over pure water approaches 100 %RH; real jars usually read ~90–100 % because of small leaks, temperature differences and the hygrometer's own limits near saturation. Condensation can form on the specimen if the room cools.";

const SALT_CAUTIONS = [
  "Keep the salt slurry away from the specimen: a splash or creeping salt crust contaminates it.",
  "Saturated salt solutions are corrosive and may give off corrosive vapour (ASTM E104): keep them off metal fittings and wipe spills.",
];
const CHLORIDE_CAUTION =
  "This is a chloride salt: chloride on iron is exactly what drives the corrosion under study, so a contaminated specimen invalidates the trial.";
const OXIDISER_CAUTION = "Oxidiser: store away from paper, wood, solvents and other combustibles.";

const VACUUM_CAUTIONS = [
  "Vacuum vessels can implode: use only vessels rated for vacuum, inspect the glass for chips and cracks, and shield or tape it.",
  "Let air back in slowly, and never heat a vessel while it is under vacuum.",
];
const INERT_GAS_CAUTIONS = [
  "Nitrogen or argon can displace the oxygen in a closed room and cause asphyxiation without warning: purge in a ventilated space.",
  "Never pressurise a sealed jar with gas; purge with the lid vented and close it at room pressure.",
];
const OPEN_SHELF_NOTE = "An open shelf follows the room: log RH and temperature, because there is no fixed point to rely on.";
const OTHER_NOTE = "Record how the humidity is held and check the chamber with a calibrated hygrometer.";

export interface HazardNotesInput {
  kind: ChamberKind;
  salt?: SaltId;
  desiccant?: DesiccantKind;
  /** Set when a silica gel carries a cobalt chloride indicator (orange/blue type). */
  cobaltIndicator?: boolean;
}

export interface HazardNotes {
  ghs: GhsStatement[];
  cautions: string[];
  deferral: string;
}

export function hazardNotes(input: HazardNotesInput): HazardNotes {
  const ghs: GhsStatement[] = [];
  const cautions: string[] = [];

  switch (input.kind) {
    case "saturated-salt": {
      if (input.salt) {
        const salt = SALTS[input.salt];
        ghs.push(...salt.ghs);
        if (salt.ghs.some((s) => s.code === "H272")) cautions.push(OXIDISER_CAUTION);
        if (salt.isChloride) cautions.push(CHLORIDE_CAUTION);
      }
      cautions.push(...SALT_CAUTIONS);
      break;
    }
    case "desiccant": {
      if (input.desiccant) cautions.push(...DESICCANTS[input.desiccant].cautions);
      if (input.desiccant === "silica-gel" && input.cobaltIndicator) {
        ghs.push(...ghsStatements(["H350i", "H360F", "H341", "H334", "H317"]));
      }
      cautions.push(GENERAL_DESICCANT_CAUTION);
      break;
    }
    case "water":
      cautions.push(WATER_CHAMBER_NOTE);
      break;
    case "vacuum":
      cautions.push(...VACUUM_CAUTIONS);
      break;
    case "inert-gas":
      cautions.push(...INERT_GAS_CAUTIONS);
      break;
    case "open-shelf":
      cautions.push(OPEN_SHELF_NOTE);
      break;
    case "other":
      cautions.push(OTHER_NOTE);
      break;
  }
  return { ghs: dedupe(ghs), cautions, deferral: SDS_DEFERRAL };
}

function dedupe(statements: GhsStatement[]): GhsStatement[] {
  const seen = new Set<string>();
  return statements.filter((s) => (seen.has(s.code) ? false : (seen.add(s.code), true)));
}

/** All notes as display lines: GHS statements, then cautions, always ending with the SDS deferral. */
export function hazardNoteLines(notes: HazardNotes): string[] {
  return [...notes.ghs.map((s) => `${s.code}: ${s.text}`), ...notes.cautions, notes.deferral];
}
