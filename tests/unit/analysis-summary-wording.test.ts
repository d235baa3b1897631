// The plain-language summary as a reader meets it: which groups rusted soonest (ties named, and by
// what "soonest" is judged), each grouping's own noun, and the scores the comparison leaves out.
import { describe, expect, it } from "vitest";
import { compareGroups } from "@/lib/analysis/compare";
import type { SpecimenOutcome } from "@/lib/analysis/derive";
import { GROUPINGS } from "@/lib/analysis/groups";
import { leftOutScoresText } from "@/lib/analysis/sentences";
import { soonestGroups, summarizeComparison } from "@/lib/stats/summary";

const DAYS = [0, 7, 14, 28];

function outcome(i: number, chamber: string, treatment: string, rustDay: number | null, materialClass = "iron-meteorite"): SpecimenOutcome {
  const observations = DAYS.map((day) => ({ inspectionId: `i${day}`, day, rusted: rustDay !== null && day >= rustDay, areaPercent: rustDay !== null && day >= rustDay ? day / 10 : 0, weeping: false }));
  const k = rustDay === null ? -1 : DAYS.indexOf(rustDay);
  return {
    placementId: `p${i}`, specimenId: `s${i}`, specimenLabel: `S-${i}`, materialClass,
    chamberId: chamber, chamberName: `Jar ${chamber}`, chamberRhPercent: { A: 2, C: 75, D: 96 }[chamber] ?? 50, treatmentId: treatment,
    treatmentName: treatment, treatmentKind: treatment === "control" ? "control" : "coating", armLabel: null, observations,
    interval: k < 0 ? { lower: 28, upper: null } : { lower: k === 0 ? 0 : DAYS[k - 1], upper: DAYS[k] },
    rusted: k >= 0, finalAreaPercent: observations[3].areaPercent, finalDay: 28, weepingSeen: false,
    entry: 0, weepingInterval: { lower: 28, upper: null }, rustedEarlier: false, weptEarlier: false,
  };
}

// Jar A never rusts; Jar C: 4 of 6 first seen rusted at day 14; Jar D: one at day 7, four at 14, one at 28.
// R 4.2.2, survival 3.5-3:
//   t <- c(rep(28,6), 14,14,14,14,28,28, 7,14,14,14,14,28); s <- c(rep(0,6), 1,1,1,1,0,0, 1,1,1,1,1,1)
//   g <- rep(c("A","C","D"), each=6)
//   survdiff(Surv(t,s) ~ g)  → Chisq = 12.3 on 2 df, p = 0.002
//   survfit(Surv(t,s) ~ g)   → median A NA, C 14, D 14 (the same median for C and D)
const rustDays: Record<string, (number | null)[]> = {
  A: [null, null, null, null, null, null],
  C: [14, 14, 14, 14, null, null],
  D: [7, 14, 14, 14, 14, 28],
};
const treatments = ["control", "wax", "lacquer"];
const jars = Object.entries(rustDays).flatMap(([jar, days], j) =>
  days.map((d, i) => outcome(j * 10 + i, jar, treatments[i % 3], d, i % 2 ? "stony-iron" : "iron-meteorite")));

describe("who rusted soonest", () => {
  it("names every chamber tied on the median, says what soonest is judged by, and gives each one's count", () => {
    for (const method of ["turnbull", "km"] as const) {
      const c = compareGroups(jars, { groupBy: "chamber", method });
      expect(c.logRank!.pValue).toBeLessThan(0.05); // R: p = 0.002 (above)
      const text = c.summary.join(" ");
      expect(text).toMatch(/The chambers differ in time to first rust at the 0\.05 level; Jar C and Jar D rusted soonest, tied on the median \((between 7 and 14|14) days each\)\./);
      // Turnbull: both medians lie in (7, 14]; Kaplan–Meier (right endpoints): both 14, as R's survfit above.
      expect(text).toMatch(/Soonest is judged by the median time to first rust; tied chambers are all named, not ranked by list order\./);
      expect(text).toMatch(/Of them, Jar C had 4 of 6 seen to rust and Jar D 6 of 6\./);
      expect(text).not.toMatch(/Jar C rusted soonest/);
    }
  });

  it("names one group, with the rule, when its median is the soonest alone", () => {
    const groups = [
      { name: "Jar C", n: 6, events: 4, median: { time: 14, lower: 7, upper: 14 } },
      { name: "Jar D", n: 6, events: 6, median: { time: 7, lower: 0, upper: 7 } },
      { name: "Jar A", n: 6, events: 0, median: null },
    ];
    expect(soonestGroups(groups).map((g) => g.name)).toEqual(["Jar D"]);
    const text = summarizeComparison({ groups, logRankP: 0.002, groupNoun: { one: "chamber", many: "chambers" } }).join(" ");
    expect(text).toMatch(/Jar D rusted soonest \(median between 0 and 7 days\)\. Soonest is judged by the median time to first rust\./);
    // Same upper end but a different interval is not a tie: (0, 14] is not (7, 14].
    expect(soonestGroups([groups[0], { ...groups[1], median: { time: 14, lower: 0, upper: 14 } }]).map((g) => g.name)).toEqual(["Jar C"]);
  });
});

describe("each grouping's own noun", () => {
  const nouns = { treatment: "treatments", chamber: "chambers", material: "material classes", arm: "chamber × treatment arms" } as const;

  it("uses treatments / chambers / material classes / chamber × treatment arms throughout the summary and notes", () => {
    for (const groupBy of GROUPINGS) {
      const c = compareGroups(jars, { groupBy });
      const text = [...c.summary, ...c.notes].join(" ");
      expect(text, groupBy).toContain(`specimens in ${c.groups.length} ${nouns[groupBy]}`);
      expect(text, groupBy).toMatch(new RegExp(`across the (${c.groups.length} )?${nouns[groupBy]}`));
      expect(text, groupBy).not.toMatch(/\bgroups\b/);
      for (const other of Object.values(nouns).filter((n) => n !== nouns[groupBy] && !nouns[groupBy].includes(n))) {
        expect(text, `${groupBy}: ${other}`).not.toMatch(new RegExp(`(the|\\d) ${other}\\b`));
      }
    }
  });

  it("grouped by material class, a large p is not read as the material classes performing the same", () => {
    // Iron and stony-iron alternate within every jar, so the classes differ little (stratified by chamber).
    const c = compareGroups(jars, { groupBy: "material" });
    expect(c.logRank!.pValue).toBeGreaterThan(0.05);
    expect(c.summary.join(" ")).toContain("that is not evidence that the material classes perform the same");
  });
});

describe("scores left out of the comparison", () => {
  it("says how many scores at which inspection are left out, and why", () => {
    const t = leftOutScoresText([{ inspectionId: "i56", dayNumber: 56, scores: 2 }], 170)!;
    expect(t.total).toBe(2);
    expect(t.analysed).toBe(168);
    expect(t.lead).toMatch(/^2 of the 170 scores of record are left out of this comparison, because an inspection counts only once it is marked done/);
    expect(`${t.items[0].before}${t.items[0].name}${t.items[0].after}`).toBe("2 scores at the day-56 inspection, which is not marked done");
    expect(t.close).toMatch(/Mark the inspection done/);
    expect(leftOutScoresText([{ inspectionId: "i7", dayNumber: 7, scores: 1 }], 1)!.items[0].before).toBe("1 score at the ");
    expect(leftOutScoresText([], 170)).toBeNull();
  });
});
