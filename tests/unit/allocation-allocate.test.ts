import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { allocate, allocateDetailed, type Assignment } from "@/lib/allocation/allocate";
import { createRng, hashSeed, mulberry32 } from "@/lib/allocation/prng";

type Specimen = { id: string; materialClass: string };

function specimens(byClass: Record<string, number>): Specimen[] {
  return Object.entries(byClass).flatMap(([cls, n]) =>
    Array.from({ length: n }, (_, i) => ({ id: `${cls}-${String(i + 1).padStart(2, "0")}`, materialClass: cls })),
  );
}
const arms = (n: number) => Array.from({ length: n }, (_, i) => ({ id: `arm-${i + 1}` }));

function countBy(assignments: Assignment[], key: (a: Assignment) => string): Map<string, number> {
  const m = new Map<string, number>();
  for (const a of assignments) m.set(key(a), (m.get(key(a)) ?? 0) + 1);
  return m;
}

function spread(counts: Map<string, number>, armIds: string[]): number {
  const values = armIds.map((a) => counts.get(a) ?? 0);
  return Math.max(...values) - Math.min(...values);
}

// Arbitrary trial: 1–5 material classes of 0–13 specimens each, 1–6 arms, any seed.
const trialArb = fc.record({
  classSizes: fc.array(fc.integer({ min: 0, max: 13 }), { minLength: 1, maxLength: 5 }),
  armCount: fc.integer({ min: 1, max: 6 }),
  seed: fc.oneof(fc.string(), fc.integer()),
});

describe("allocate", () => {
  it("allocates every specimen exactly once, to a known arm", () => {
    fc.assert(
      fc.property(trialArb, ({ classSizes, armCount, seed }) => {
        const sp = specimens(Object.fromEntries(classSizes.map((n, i) => [`class${i}`, n])));
        const ar = arms(armCount);
        const result = allocate({ specimens: sp, arms: ar, seed, blockBy: "materialClass" });
        expect(result.map((a) => a.specimenId).sort()).toEqual(sp.map((s) => s.id).sort());
        const armIds = new Set(ar.map((a) => a.id));
        expect(result.every((a) => armIds.has(a.armId))).toBe(true);
      }),
    );
  });

  it("blocked: arm counts differ by at most 1 inside every block and overall", () => {
    fc.assert(
      fc.property(trialArb, ({ classSizes, armCount, seed }) => {
        const sp = specimens(Object.fromEntries(classSizes.map((n, i) => [`class${i}`, n])));
        const ar = arms(armCount);
        const armIds = ar.map((a) => a.id);
        const result = allocate({ specimens: sp, arms: ar, seed, blockBy: "materialClass" });
        const classOf = new Map(sp.map((s) => [s.id, s.materialClass]));
        for (const cls of new Set(sp.map((s) => s.materialClass))) {
          const inBlock = result.filter((a) => classOf.get(a.specimenId) === cls);
          expect(spread(countBy(inBlock, (a) => a.armId), armIds)).toBeLessThanOrEqual(1);
        }
        expect(spread(countBy(result, (a) => a.armId), armIds)).toBeLessThanOrEqual(1);
      }),
      { numRuns: 300 },
    );
  });

  it("unblocked: overall arm sizes differ by at most 1", () => {
    fc.assert(
      fc.property(trialArb, ({ classSizes, armCount, seed }) => {
        const sp = specimens(Object.fromEntries(classSizes.map((n, i) => [`class${i}`, n])));
        const ar = arms(armCount);
        const result = allocate({ specimens: sp, arms: ar, seed, blockBy: null });
        expect(spread(countBy(result, (a) => a.armId), ar.map((a) => a.id))).toBeLessThanOrEqual(1);
      }),
    );
  });

  it("is reproducible for a seed and independent of input order", () => {
    const sp = specimens({ iron: 9, "stony-iron": 7, archaeological: 5 });
    const input = { specimens: sp, arms: arms(3), seed: "trial-2025-A", blockBy: "materialClass" as const };
    const first = allocate(input);
    expect(allocate(input)).toEqual(first);
    const reordered = allocate({ ...input, specimens: sp.slice().reverse(), arms: arms(3).reverse() });
    const byId = (list: Assignment[]) => Object.fromEntries(list.map((a) => [a.specimenId, a.armId]));
    expect(byId(reordered)).toEqual(byId(first));
    // A number seed and its decimal string are the same seed (form fields arrive as text).
    expect(allocate({ ...input, seed: 42 })).toEqual(allocate({ ...input, seed: "42" }));
  });

  it("differs across seeds", () => {
    const sp = specimens({ iron: 12, "stony-iron": 12 });
    const key = (seed: number) =>
      allocate({ specimens: sp, arms: arms(3), seed, blockBy: "materialClass" })
        .map((a) => a.armId)
        .join(",");
    const distinct = new Set(Array.from({ length: 50 }, (_, i) => key(i)));
    // 24 specimens in 3 arms have billions of balanced allocations; 50 seeds colliding would be a bug.
    expect(distinct.size).toBe(50);
  });

  it("rejects duplicate ids and an empty arm list", () => {
    const sp = specimens({ iron: 3 });
    expect(() => allocate({ specimens: sp, arms: [], seed: 1 })).toThrow(RangeError);
    expect(() => allocate({ specimens: sp, arms: [{ id: "a" }, { id: "a" }], seed: 1 })).toThrow(RangeError);
    expect(() => allocate({ specimens: [...sp, sp[0]], arms: arms(2), seed: 1 })).toThrow(RangeError);
  });
});

describe("allocateDetailed with replicatesPerArm", () => {
  it("uses arms × replicates specimens, exactly replicates per arm, and reports the rest", () => {
    fc.assert(
      fc.property(
        fc.record({
          classSizes: fc.array(fc.integer({ min: 1, max: 12 }), { minLength: 1, maxLength: 4 }),
          armCount: fc.integer({ min: 1, max: 5 }),
          seed: fc.string(),
          share: fc.double({ min: 0, max: 1, noNaN: true }),
        }),
        ({ classSizes, armCount, seed, share }) => {
          const sp = specimens(Object.fromEntries(classSizes.map((n, i) => [`class${i}`, n])));
          const maxReps = Math.floor(sp.length / armCount);
          fc.pre(maxReps >= 1);
          const reps = 1 + Math.floor(share * (maxReps - 1));
          const ar = arms(armCount);
          const { assignments, unallocated } = allocateDetailed({
            specimens: sp,
            arms: ar,
            seed,
            blockBy: "materialClass",
            replicatesPerArm: reps,
          });
          expect(assignments).toHaveLength(armCount * reps);
          for (const a of ar) expect(assignments.filter((x) => x.armId === a.id)).toHaveLength(reps);
          expect([...assignments.map((a) => a.specimenId), ...unallocated].sort()).toEqual(sp.map((s) => s.id).sort());
          const classOf = new Map(sp.map((s) => [s.id, s.materialClass]));
          for (const cls of new Set(sp.map((s) => s.materialClass))) {
            const inBlock = assignments.filter((a) => classOf.get(a.specimenId) === cls);
            expect(spread(countBy(inBlock, (a) => a.armId), ar.map((a) => a.id))).toBeLessThanOrEqual(1);
          }
        },
      ),
      { numRuns: 300 },
    );
  });

  it("draws from blocks in proportion to their size", () => {
    // 20 iron + 10 stony-iron, 12 needed: quotas 8 and 4 (largest remainder, exact here).
    const sp = specimens({ iron: 20, "stony-iron": 10 });
    const { assignments, unallocated } = allocateDetailed({
      specimens: sp,
      arms: arms(3),
      seed: "p",
      blockBy: "materialClass",
      replicatesPerArm: 4,
    });
    expect(assignments.filter((a) => a.specimenId.startsWith("iron-"))).toHaveLength(8);
    expect(assignments.filter((a) => a.specimenId.startsWith("stony-iron-"))).toHaveLength(4);
    expect(unallocated).toHaveLength(18);
  });

  it("refuses when there are too few specimens for the replicates", () => {
    expect(() =>
      allocateDetailed({ specimens: specimens({ iron: 5 }), arms: arms(3), seed: 1, replicatesPerArm: 2 }),
    ).toThrow(RangeError);
    expect(() => allocate({ specimens: specimens({ iron: 5 }), arms: arms(2), seed: 1, replicatesPerArm: 0 })).toThrow(RangeError);
  });
});

describe("prng", () => {
  it("mulberry32 is deterministic and in [0, 1)", () => {
    const a = mulberry32(123);
    const b = mulberry32(123);
    const xs = Array.from({ length: 1000 }, () => a());
    expect(Array.from({ length: 1000 }, () => b())).toEqual(xs);
    expect(xs.every((x) => x >= 0 && x < 1)).toBe(true);
    // Mean of 1000 uniforms: 0.5 ± 3·sqrt(1/12/1000) ≈ ±0.027 (uniform distribution)
    expect(Math.abs(xs.reduce((s, x) => s + x, 0) / 1000 - 0.5)).toBeLessThan(0.03);
  });

  it("hashes seeds to distinct 32-bit values", () => {
    const hashes = new Set(["", "a", "b", "ab", "ba", "1", "2", "trial"].map(hashSeed));
    expect(hashes.size).toBe(8);
    for (const h of hashes) expect(Number.isInteger(h) && h >= 0 && h < 2 ** 32).toBe(true);
    expect(createRng("x")()).toBe(createRng("x")());
    expect(() => hashSeed(Number.NaN)).toThrow(RangeError);
  });
});
