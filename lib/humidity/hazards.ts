// Hazard notes shown beside a chamber. GHS codes come from the salt and desiccant references;
// the practice cautions are common lab practice (trade practice, not a cited source). We never stand in
// for the safety data sheet, so every result ends with the same deferral.

import { DESICCANTS, GENERAL_DESICCANT_CAUTION, type DesiccantKind, type IndicatorKind } from "@/lib/humidity/desiccant";
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
  /** The colour indicator in a silica gel charge (ignored for desiccants that take none). */
  indicator?: IndicatorKind;
}

/**
 * Cobalt(II) chloride's harmonised classification (EU CLP Annex VI, from memory): Carc. 1B H350i,
 * Repr. 1B H360F, Muta. 2 H341, Resp. Sens. 1 H334, Skin Sens. 1 H317, Acute Tox. 4 H302,
 * Aquatic Chronic 1 H410. The gel's own SDS gives the classification of the mixture.
 */
export const COBALT_CHLORIDE_GHS = ["H350i", "H360F", "H341", "H334", "H317", "H302", "H410"] as const;
export const COBALT_CHLORIDE_CAUTION =
  "Cobalt(II) chloride indicator is a category 1B carcinogen (by inhalation) and reproductive toxicant: avoid gel dust, handle and regenerate the beads with gloves in a ventilated place, keep them out of reach of the specimens' handling area, and dispose of spent gel as hazardous waste. Prefer a cobalt-free indicator.";
export const COBALT_FREE_NOTE =
  "Cobalt-free indicators avoid the cobalt carcinogen classification but are not hazard-free and change colour at their own RH: check their SDS and compare the colour change with a hygrometer before relying on it.";

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
        cautions.push(...(salt.cautions ?? []));
        if (salt.ghs.some((s) => s.code === "H272")) cautions.push(OXIDISER_CAUTION);
        if (salt.isChloride) cautions.push(CHLORIDE_CAUTION);
      }
      cautions.push(...SALT_CAUTIONS);
      break;
    }
    case "desiccant": {
      const info = input.desiccant ? DESICCANTS[input.desiccant] : null;
      if (info) {
        ghs.push(...info.ghs);
        cautions.push(...info.cautions);
      }
      if (info?.takesIndicator && input.indicator === "cobalt-chloride") {
        ghs.push(...ghsStatements(COBALT_CHLORIDE_GHS));
        cautions.push(COBALT_CHLORIDE_CAUTION);
      }
      if (info?.takesIndicator && input.indicator === "cobalt-free") cautions.push(COBALT_FREE_NOTE);
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
