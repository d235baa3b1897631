// Seeded random allocation of specimens to treatment arms, optionally blocked by material class
// and by specimen history (parent piece, chloride state).
//
// Rules (shown to researchers, so keep them plain):
// - The result depends only on the seed and on the sets of specimen and arm ids, not on their
//   input order: specimens are sorted by id, arms by id, and blocks by key before any random draw.
//   The product passes printed labels as the ids (allocateByLabel), never database ids, so the
//   same seed and the same lists give the same allocation on every installation.
// - Blocked: inside each block the specimens are shuffled and dealt one by one around a cycle of
//   the arms. The cycle starts with the arms that hold the fewest specimens so far (ties broken at
//   random), so each arm's count inside a block differs by at most 1 and, because leftovers always
//   go to the emptiest arms, overall arm sizes also differ by at most 1.
// - replicatesPerArm: only arms × replicates specimens are used, drawn from the blocks in
//   proportion to block size (largest remainder, ties at random); the rest are reported unallocated.
import { createRng, shuffled, type Rng } from "./prng";

/** What a block can be made of; a block is the specimens sharing every chosen factor's value. */
export const BLOCK_FACTORS = ["materialClass", "parentPiece", "chlorideState"] as const;
export type BlockFactor = (typeof BLOCK_FACTORS)[number];
export const BLOCK_FACTOR_LABELS: Record<BlockFactor, string> = { materialClass: "material class", parentPiece: "parent piece", chlorideState: "chloride test result" };
/** null or [] is one block of all specimens; "materialClass" is the same as ["materialClass"]. */
export type BlockBy = BlockFactor | readonly BlockFactor[] | null;

export type AllocationSpecimen = { id: string; materialClass: string; parentPiece?: string; chlorideState?: string };
export type AllocationArm = { id: string };
export type Assignment = { specimenId: string; armId: string };

export type AllocationInput = {
  specimens: readonly AllocationSpecimen[];
  arms: readonly AllocationArm[];
  seed: string | number;
  blockBy?: BlockBy;
  replicatesPerArm?: number | null;
};

export type AllocationResult = {
  assignments: Assignment[];
  /** Specimen ids left out because replicatesPerArm asked for fewer specimens than were given. */
  unallocated: string[];
};

/** Assignments only; see allocateDetailed for the unallocated specimens. */
export function allocate(input: AllocationInput): Assignment[] {
  return allocateDetailed(input).assignments;
}

export function allocateDetailed(input: AllocationInput): AllocationResult {
  validate(input);
  const rng = createRng(input.seed);
  const arms = input.arms.map((a) => a.id).sort(compareIds);
  const specimens = input.specimens.slice().sort((a, b) => compareIds(a.id, b.id));

  const blocks = groupIntoBlocks(specimens, input.blockBy ?? null);
  let unallocated: string[] = [];
  if (input.replicatesPerArm != null) {
    const needed = arms.length * input.replicatesPerArm;
    if (needed > specimens.length) {
      throw new RangeError(
        `replicatesPerArm ${input.replicatesPerArm} × ${arms.length} arms needs ${needed} specimens; only ${specimens.length} given`,
      );
    }
    const picked = pickProportionally(blocks, needed, rng);
    unallocated = picked.leftOut;
    blocks.splice(0, blocks.length, ...picked.blocks);
  }

  const armCounts = new Map<string, number>(arms.map((a) => [a, 0]));
  const armOf = new Map<string, string>();
  for (const block of blocks) {
    const order = cycleOrder(arms, armCounts, rng);
    const dealt = shuffled(block.ids, rng);
    dealt.forEach((specimenId, i) => {
      const armId = order[i % order.length] as string;
      armOf.set(specimenId, armId);
      armCounts.set(armId, (armCounts.get(armId) ?? 0) + 1);
    });
  }

  // Report in the caller's order so a table of specimens lines up with its assignments.
  const assignments: Assignment[] = [];
  for (const s of input.specimens) {
    const armId = armOf.get(s.id);
    if (armId !== undefined) assignments.push({ specimenId: s.id, armId });
  }
  const leftOutSet = new Set(unallocated);
  unallocated = input.specimens.filter((s) => leftOutSet.has(s.id)).map((s) => s.id);
  return { assignments, unallocated };
}

type Block = { key: string; ids: string[] };

function factorsOf(blockBy: BlockBy): BlockFactor[] {
  if (blockBy === null) return [];
  return BLOCK_FACTORS.filter((f) => (typeof blockBy === "string" ? blockBy === f : blockBy.includes(f)));
}

/**
 * A specimen's block: the values of the chosen factors in BLOCK_FACTORS order, joined by " · "
 * (a missing value counts as "none"); with material class alone it is the class itself.
 */
export function blockKeyOf(s: AllocationSpecimen, blockBy: BlockBy): string {
  return factorsOf(blockBy).map((f) => s[f] || "none").join(" · ");
}

function groupIntoBlocks(specimens: readonly AllocationSpecimen[], blockBy: BlockBy): Block[] {
  if (factorsOf(blockBy).length === 0) return [{ key: "", ids: specimens.map((s) => s.id) }];
  const byKey = new Map<string, string[]>();
  for (const s of specimens) {
    const key = blockKeyOf(s, blockBy);
    const list = byKey.get(key) ?? [];
    list.push(s.id);
    byKey.set(key, list);
  }
  return [...byKey.entries()]
    .sort(([a], [b]) => compareIds(a, b))
    .map(([key, ids]) => ({ key, ids }));
}

/** Arms with the fewest specimens so far come first; ties are shuffled. */
function cycleOrder(arms: readonly string[], counts: Map<string, number>, rng: Rng): string[] {
  const tieBreak = new Map(shuffled(arms, rng).map((a, i) => [a, i]));
  return arms
    .slice()
    .sort((a, b) => (counts.get(a) ?? 0) - (counts.get(b) ?? 0) || (tieBreak.get(a) ?? 0) - (tieBreak.get(b) ?? 0));
}

/** Hamilton (largest remainder) quotas per block, then a random subset inside each block. */
function pickProportionally(blocks: readonly Block[], needed: number, rng: Rng): { blocks: Block[]; leftOut: string[] } {
  const total = blocks.reduce((n, b) => n + b.ids.length, 0);
  const exact = blocks.map((b) => (b.ids.length * needed) / total);
  const quota = exact.map(Math.floor);
  let remaining = needed - quota.reduce((a, b) => a + b, 0);
  const jitter = blocks.map(() => rng());
  const byRemainder = blocks
    .map((_, i) => i)
    .sort((i, j) => exact[j] - quota[j] - (exact[i] - quota[i]) || jitter[i] - jitter[j]);
  for (const i of byRemainder) {
    if (remaining === 0) break;
    if (quota[i] < blocks[i].ids.length) {
      quota[i] += 1;
      remaining -= 1;
    }
  }
  const leftOut: string[] = [];
  const kept = blocks.map((b, i) => {
    const order = shuffled(b.ids, rng);
    leftOut.push(...order.slice(quota[i]));
    return { key: b.key, ids: order.slice(0, quota[i]).sort(compareIds) };
  });
  return { blocks: kept.filter((b) => b.ids.length > 0), leftOut };
}

function validate(input: AllocationInput): void {
  if (input.arms.length === 0) throw new RangeError("at least one arm is needed");
  assertUnique(input.arms.map((a) => a.id), "arm");
  assertUnique(input.specimens.map((s) => s.id), "specimen");
  const r = input.replicatesPerArm;
  if (r != null && (!Number.isInteger(r) || r < 1)) {
    throw new RangeError(`replicatesPerArm must be a positive integer, got ${r}`);
  }
}

function assertUnique(ids: readonly string[], what: string): void {
  const seen = new Set<string>();
  for (const id of ids) {
    if (seen.has(id)) throw new RangeError(`duplicate ${what} id ${id}`);
    seen.add(id);
  }
}

/** Code-unit order, not locale order, so every machine sorts the same way. */
function compareIds(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

export type LabelledSpecimen = { id: string; label: string; materialClass: string; parentPiece?: string; chlorideState?: string };
export type LabelledArm = { id: string; label: string; chamberId: string };

/** Arm keys for the allocation: the label, made unique with the chamber id if two chambers share a name. */
export function armKeysOf(arms: readonly LabelledArm[]): Map<string, string> {
  const seen = new Map<string, number>();
  for (const a of arms) seen.set(a.label, (seen.get(a.label) ?? 0) + 1);
  return new Map(arms.map((a) => [a.id, (seen.get(a.label) ?? 0) > 1 ? `${a.label} [${a.chamberId.slice(0, 8)}]` : a.label]));
}

/**
 * The allocation keyed by the printed labels, not database ids (which differ per installation), so
 * anyone holding the seed, the specimen labels and the arm labels can re-derive it with
 * allocateDetailed. Used by the allocation form and the demo seed alike. Returns database ids and
 * the label form.
 */
export function allocateByLabel(input: {
  specimens: readonly LabelledSpecimen[];
  arms: readonly LabelledArm[];
  seed: string | number;
  blockBy?: BlockBy;
  replicatesPerArm?: number | null;
}): AllocationResult & { byLabel: AllocationResult } {
  const armKeys = armKeysOf(input.arms);
  const armByKey = new Map(input.arms.map((a) => [armKeys.get(a.id)!, a.id]));
  const specimenByLabel = new Map(input.specimens.map((s) => [s.label, s.id]));
  if (specimenByLabel.size !== input.specimens.length) throw new RangeError("specimen labels must be unique");
  const byLabel = allocateDetailed({
    specimens: input.specimens.map((s) => ({ id: s.label, materialClass: s.materialClass, parentPiece: s.parentPiece, chlorideState: s.chlorideState })),
    arms: [...armByKey.keys()].map((id) => ({ id })),
    seed: input.seed, blockBy: input.blockBy, replicatesPerArm: input.replicatesPerArm,
  });
  return {
    assignments: byLabel.assignments.map((a) => ({ specimenId: specimenByLabel.get(a.specimenId)!, armId: armByKey.get(a.armId)! })),
    unallocated: byLabel.unallocated.map((l) => specimenByLabel.get(l)!),
    byLabel,
  };
}

/** How a trial's allocation was blocked, in words, e.g. "blocked by material class and parent piece". */
export function blockText(trial: { blockByMaterial: boolean; blockFactors: readonly string[] }): string {
  const factors = [...(trial.blockByMaterial ? ["materialClass"] : []), ...trial.blockFactors].filter((f): f is BlockFactor => f in BLOCK_FACTOR_LABELS);
  return factors.length ? `blocked by ${factors.map((f) => BLOCK_FACTOR_LABELS[f]).join(" and ")}` : "not blocked";
}
