// The design warnings. The rules are common practice in experimental design, not computed values:
// confounding of a factor with its only experimental unit (one jar per humidity level) — Hurlbert S. H.
// (1984) "Pseudoreplication and the design of ecological field experiments", Ecological Monographs
// 54:187–211 (from memory); a concurrent control in every block; at least three levels to see a
// curved dose response; at least two replicates to estimate the error (common practice).
import { describe, expect, it } from "vitest";
import { crossArms, designWarnings, humidityLevel, type DesignWarningCode } from "@/lib/trials/design-checks";

const jar = (id: string, setpointRhPercent: number, nominalTempC = 21) => ({ id, name: `Jar ${id}`, setpointRhPercent, nominalTempC });
const control = { id: "c", name: "Uncoated control", kind: "control" };
const wax = { id: "w", name: "Wax", kind: "coating" };
const lacquer = { id: "l", name: "Lacquer", kind: "coating" };

const codes = (chambers: ReturnType<typeof jar>[], treatments: { id: string; name: string; kind: string }[], replicatesPerArm = 3): DesignWarningCode[] =>
  designWarnings({ arms: crossArms(chambers, treatments), replicatesPerArm }).map((w) => w.code);

// Two jars at each of three humidity levels, control in every jar, three replicates: nothing to warn of.
const sound = [jar("A1", 33), jar("A2", 33), jar("B1", 54), jar("B2", 54), jar("C1", 75), jar("C2", 75)];

describe("designWarnings", () => {
  it("finds nothing wrong with a sound design, and nothing to judge without arms", () => {
    expect(codes(sound, [control, wax])).toEqual([]);
    expect(designWarnings({ arms: [], replicatesPerArm: 1 })).toEqual([]);
  });

  it("warns of one jar per humidity level, naming the level and the jar", () => {
    const w = designWarnings({ arms: crossArms([...sound, jar("D", 96)], [control]), replicatesPerArm: 3 });
    expect(w.map((x) => x.code)).toEqual(["one-jar-per-humidity"]);
    expect(w[0].message).toContain("one jar per humidity level");
    expect(w[0].message).toContain("96 %RH (Jar D)");
    expect(w[0].message).not.toContain("33 %RH");
    // Every level with a single jar is named.
    expect(designWarnings({ arms: crossArms([jar("A", 2), jar("B", 33), jar("C", 75)], [control]), replicatesPerArm: 3 })[0].message)
      .toContain("2 %RH (Jar A), 33 %RH (Jar B) and 75 %RH (Jar C)");
  });

  it("treats setpoints within the same whole %RH as one humidity level", () => {
    expect(humidityLevel(75.4)).toBe(75);
    expect(humidityLevel(74.6)).toBe(75);
    // 75.4 and 74.6 %RH are one level with two jars, so no lone jar there.
    expect(codes([jar("A1", 33), jar("A2", 33), jar("B1", 54), jar("B2", 54), jar("C1", 75.4), jar("C2", 74.6)], [control])).toEqual([]);
    // 75.4 and 76 %RH are two levels of one jar each.
    expect(codes([jar("A1", 33), jar("A2", 33), jar("B1", 54), jar("B2", 54), jar("C1", 75.4), jar("C2", 76)], [control])).toEqual(["one-jar-per-humidity"]);
  });

  it("warns of a chamber without the control treatment, naming the jars", () => {
    const w = designWarnings({ arms: crossArms(sound, [wax, lacquer]), replicatesPerArm: 3 });
    expect(w.map((x) => x.code)).toEqual(["chamber-without-control"]);
    expect(w[0].message).toMatch(/^No jar has the control treatment: treatment effects in those jars have nothing to be read against/);
    // Arms need not be a full cross: one jar lacking the control is named alone.
    const arms = crossArms(sound, [control, wax]).filter((a) => !(a.chamberId === "B2" && a.treatmentKind === "control"));
    const one = designWarnings({ arms, replicatesPerArm: 3 });
    expect(one.map((x) => x.code)).toEqual(["chamber-without-control"]);
    expect(one[0].message).toMatch(/^Jar B2 has no control treatment: /);
    expect(one[0].message).toContain("in that jar have nothing to be read against");
    const two = designWarnings({ arms: crossArms(sound, [control, wax]).filter((a) => !(a.chamberId.startsWith("C") && a.treatmentKind === "control")), replicatesPerArm: 3 });
    expect(two[0].message).toMatch(/^Jar C1 and Jar C2 have no control treatment: treatment effects in those jars/);
  });

  it("warns of fewer than three humidity levels", () => {
    const two = designWarnings({ arms: crossArms([jar("A1", 33), jar("A2", 33), jar("B1", 75), jar("B2", 75)], [control]), replicatesPerArm: 3 });
    expect(two.map((x) => x.code)).toEqual(["few-humidity-levels"]);
    expect(two[0].message).toContain("Only 2 humidity levels (33 and 75 %RH): no storage rule can be estimated");
    expect(codes([jar("A1", 33), jar("A2", 33)], [control])).toEqual(["few-humidity-levels"]);
    expect(codes(sound, [control])).not.toContain("few-humidity-levels");
  });

  it("warns of a single replicate per arm, and not of two or more", () => {
    expect(codes(sound, [control], 1)).toEqual(["few-replicates"]);
    expect(codes(sound, [control], 2)).toEqual([]);
    // A value the form has not validated yet (empty, NaN) is left to the field's own message.
    expect(codes(sound, [control], Number.NaN)).toEqual([]);
  });

  it("warns of jars at different temperatures", () => {
    const w = designWarnings({ arms: crossArms([...sound.slice(0, 5), jar("C2", 75, 25)], [control]), replicatesPerArm: 3 });
    expect(w.map((x) => x.code)).toEqual(["mixed-temperatures"]);
    expect(w[0].message).toContain("(21 and 25 °C)");
    expect(codes(sound, [control])).not.toContain("mixed-temperatures");
  });

  it("gives every warning that applies to a poor design, in a fixed order", () => {
    // The demo lab's Jar A (2 %RH) and Jar B (33 %RH), wax only, one replicate.
    expect(codes([jar("A", 2), jar("B", 33)], [wax], 1)).toEqual(["one-jar-per-humidity", "chamber-without-control", "few-humidity-levels", "few-replicates"]);
  });
});
