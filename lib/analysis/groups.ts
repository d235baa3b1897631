// How specimens are grouped for a comparison, and in what order the groups are listed.
import type { SpecimenOutcome } from "./derive";

export const GROUPINGS = ["treatment", "chamber", "material", "arm"] as const;
export type Grouping = (typeof GROUPINGS)[number];

export const GROUPING_LABELS: Record<Grouping, string> = {
  treatment: "Treatment",
  chamber: "Chamber",
  material: "Material class",
  arm: "Chamber × treatment",
};

/** The noun the summary and notes use for the groups of each grouping ("3 treatments", "each chamber"). */
export interface GroupNoun {
  one: string;
  many: string;
}
export const GROUPING_NOUNS: Record<Grouping, GroupNoun> = {
  treatment: { one: "treatment", many: "treatments" },
  chamber: { one: "chamber", many: "chambers" },
  material: { one: "material class", many: "material classes" },
  arm: { one: "chamber × treatment arm", many: "chamber × treatment arms" },
};

export const MATERIAL_LABELS: Record<string, string> = {
  "iron-meteorite": "Iron meteorite",
  "stony-iron": "Stony-iron meteorite",
  chondrite: "Chondrite",
  "archaeological-iron": "Archaeological iron",
  "steel-coupon": "Steel coupon",
  other: "Other material",
};

/**
 * The stratum of each grouping's log-rank tests: treatments and material classes are compared within
 * each chamber (jars from 2 % to 96 %RH must not be pooled); chambers, and arms that are already
 * chamber × treatment, are compared as they are.
 */
export const GROUPING_STRATA: Record<Grouping, "chamber" | null> = {
  treatment: "chamber",
  material: "chamber",
  chamber: null,
  arm: null,
};

export interface GroupOf<T> {
  key: string;
  label: string;
  members: T[];
}

// Controls first (they are the reference the others are read against), then by name.
function treatmentRank(o: SpecimenOutcome): string {
  return `${o.treatmentKind === "control" ? 0 : 1}|${o.treatmentName}`;
}
// Chambers from driest to wettest: the order a reader expects rust to get worse in.
function chamberRank(o: SpecimenOutcome): string {
  return `${String(Math.round(o.chamberRhPercent * 100)).padStart(6, "0")}|${o.chamberName}`;
}

function keyOf(o: SpecimenOutcome, by: Grouping): { key: string; label: string; rank: string } {
  switch (by) {
    case "treatment":
      return { key: o.treatmentId, label: o.treatmentName, rank: treatmentRank(o) };
    case "chamber":
      return { key: o.chamberId, label: o.chamberName, rank: chamberRank(o) };
    case "material":
      return { key: o.materialClass, label: MATERIAL_LABELS[o.materialClass] ?? o.materialClass, rank: o.materialClass };
    case "arm":
      return {
        key: `${o.chamberId}|${o.treatmentId}`,
        label: o.armLabel ?? `${o.chamberName} / ${o.treatmentName}`,
        rank: `${chamberRank(o)}|${treatmentRank(o)}`,
      };
  }
}

export function groupOutcomes(outcomes: readonly SpecimenOutcome[], by: Grouping): GroupOf<SpecimenOutcome>[] {
  const groups = new Map<string, GroupOf<SpecimenOutcome> & { rank: string }>();
  for (const o of outcomes) {
    const { key, label, rank } = keyOf(o, by);
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { key, label, rank, members: [] }));
    g.members.push(o);
  }
  return [...groups.values()]
    .sort((a, b) => (a.rank < b.rank ? -1 : a.rank > b.rank ? 1 : 0))
    .map(({ key, label, members }) => ({ key, label, members }));
}
