// The comparison charts as a reader sees them: vega-lite compiles each spec and vega draws it to SVG
// here (no browser), so the test reads the colours, dash patterns, panels and legend actually drawn.
import { describe, expect, it } from "vitest";
import { compile, type TopLevelSpec } from "vega-lite";
import { parse, View } from "vega";
import type { VisualizationSpec } from "vega-embed";
import { areaSpec, survivalSpec } from "@/components/analysis/chart-specs";
import { CATEGORY_PALETTE, DASH_PATTERNS } from "@/components/ui/chart-palette";
import { compareGroups } from "@/lib/analysis/compare";
import type { SpecimenOutcome } from "@/lib/analysis/derive";

const DAYS = [0, 7, 14, 28];

/** A specimen in `chamber` × `treatment`, first seen rusted at `rustDay` (null: never), scored at DAYS. */
function outcome(i: number, chamber: string, treatment: string, rustDay: number | null): SpecimenOutcome {
  const observations = DAYS.map((day) => ({ inspectionId: `i${day}`, day, rusted: rustDay !== null && day >= rustDay, areaPercent: rustDay !== null && day >= rustDay ? day / 10 : 0, weeping: false }));
  const k = rustDay === null ? -1 : DAYS.indexOf(rustDay);
  return {
    placementId: `p${i}`, specimenId: `s${i}`, specimenLabel: `S-${i}`, materialClass: "iron-meteorite",
    chamberId: chamber, chamberName: `Jar ${chamber}`, chamberRhPercent: chamber.charCodeAt(0), treatmentId: treatment,
    treatmentName: treatment, treatmentKind: treatment === "control" ? "control" : "coating", armLabel: null, observations,
    interval: k < 0 ? { lower: 28, upper: null } : { lower: k === 0 ? 0 : DAYS[k - 1], upper: DAYS[k] },
    rusted: k >= 0, finalAreaPercent: observations[3].areaPercent, finalDay: 28, weepingSeen: false,
    entry: 0, weepingInterval: { lower: 28, upper: null }, rustedEarlier: false, weptEarlier: false,
  };
}

// Four jars × three treatments, two specimens per arm: 12 chamber × treatment arms.
const outcomes = ["A", "B", "C", "D"].flatMap((jar, j) => ["control", "wax", "lacquer"].flatMap((t, k) =>
  [0, 1].map((r) => outcome(j * 10 + k * 2 + r, jar, t, r === 0 && j + k > 1 ? DAYS[Math.min(3, j + k - 1)] : null))));

async function draw(spec: VisualizationSpec): Promise<string> {
  const s = spec as TopLevelSpec & { width?: unknown };
  const sized = s.width === "container" ? { ...s, width: 600 } : s; // no page container outside the browser
  const view = new View(parse(compile(sized as TopLevelSpec).spec), { renderer: "none" });
  return view.toSVG();
}

/** Stroke colour and dash of every drawn line (a path with a stroke and no fill). */
function lines(svg: string): { stroke: string; dash: string }[] {
  return [...svg.matchAll(/<path [^>]*?stroke="(#[0-9a-f]{6})"[^>]*>/gi)]
    .filter((m) => /fill="none"|fill="transparent"/.test(m[0]) || !/fill="#/.test(m[0]))
    .map((m) => ({ stroke: m[1].toLowerCase(), dash: /stroke-dasharray="([^"]*)"/.exec(m[0])?.[1] ?? "" }));
}

describe("comparison charts", () => {
  it("draws three treatments in one chart, each in its own colour and dash pattern, with one legend", async () => {
    const c = compareGroups(outcomes, { groupBy: "treatment" });
    expect(c.groups.map((g) => g.label)).toEqual(["control", "lacquer", "wax"]);
    for (const spec of [survivalSpec(c.groups, "turnbull"), survivalSpec(c.groups, "km"), areaSpec(c.groups)]) {
      const svg = await draw(spec);
      expect(svg).not.toMatch(/class="mark-group role-scope cell"/); // one panel
      const drawn = lines(svg).filter((l) => CATEGORY_PALETTE.slice(0, 3).includes(l.stroke as never));
      expect(new Set(drawn.map((l) => l.stroke)).size).toBe(3);
      // Each colour has its own dash: solid for the first group, dashed for the others.
      const dashOf = new Map(drawn.map((l) => [l.stroke, l.dash]));
      expect(new Set(dashOf.values()).size).toBe(3);
      expect(dashOf.get(CATEGORY_PALETTE[1])).toBe(DASH_PATTERNS[1].join(","));
      // One legend naming each group once.
      expect(svg.match(/role-legend"/g)?.length).toBe(1);
      for (const g of c.groups) expect(svg).toContain(`>${g.label}<`);
    }
  });

  it("draws more than six groups as small multiples: a panel per arm with the other arms faint behind, no legend", async () => {
    const c = compareGroups(outcomes, { groupBy: "arm" });
    expect(c.groups).toHaveLength(12);
    for (const spec of [survivalSpec(c.groups, "turnbull"), areaSpec(c.groups)]) {
      const svg = await draw(spec);
      expect(svg.match(/role-legend"/g) ?? []).toHaveLength(0);
      // Every panel is headed with its arm's name (chamber, then treatment on a second line).
      for (const g of c.groups) for (const part of g.label.split(" / ")) expect(svg).toContain(`>${part}<`);
      const drawn = lines(svg);
      // In each panel one line in the arm's colour; the 11 others in the pale context grey.
      for (let i = 0; i < 12; i++) expect(drawn.filter((l) => l.stroke === CATEGORY_PALETTE[i]).length, c.groups[i].label).toBeGreaterThanOrEqual(1);
      expect(drawn.filter((l) => l.stroke === "#c3c8ce")).toHaveLength(12 * 11);
    }
  });
});

// sRGB (IEC 61966-2-1) → CIELAB (D65 white), CIE76 colour difference.
function lab(hex: string): [number, number, number] {
  const lin = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255).map((c) => (c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
  const [r, g, b] = lin;
  const xyz = [0.4124 * r + 0.3576 * g + 0.1805 * b, 0.2126 * r + 0.7152 * g + 0.0722 * b, 0.0193 * r + 0.1192 * g + 0.9505 * b];
  const white = [0.95047, 1, 1.08883];
  const f = (t: number) => (t > (6 / 29) ** 3 ? Math.cbrt(t) : t / (3 * (6 / 29) ** 2) + 4 / 29);
  const [fx, fy, fz] = xyz.map((v, i) => f(v / white[i]));
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}
const deltaE = (a: string, b: string) => Math.hypot(...lab(a).map((v, i) => v - lab(b)[i]));

describe("category palette", () => {
  it("converts sRGB to CIELAB as published", () => {
    // From memory: sRGB #FF0000 under D65 is L* 53.24, a* 80.09, b* 67.20 (Lindbloom's colour calculator).
    const red = lab("#ff0000");
    expect(red[0]).toBeCloseTo(53.24, 1);
    expect(red[1]).toBeCloseTo(80.09, 0);
    expect(red[2]).toBeCloseTo(67.2, 0);
    expect(lab("#ffffff")[0]).toBeCloseTo(100, 2);
  });

  it("keeps the colours of one chart (up to six) well apart, not several near-identical dark tones", () => {
    const six = CATEGORY_PALETTE.slice(0, 6);
    let min = Infinity;
    for (let i = 0; i < six.length; i++) for (let j = i + 1; j < six.length; j++) min = Math.min(min, deltaE(six[i], six[j]));
    // ΔE*ab ≈ 2.3 is a just-noticeable difference (Sharma G, Digital Color Imaging Handbook, 2003; from memory); 25 is far apart.
    expect(min).toBeGreaterThan(25);
    // Their lightness spreads over a wide range (L* 44–77; the earlier palette sat at 35–57, all dark), so
    // they stay apart in greyscale print as well.
    const l = six.map((h) => lab(h)[0]);
    expect(Math.max(...l) - Math.min(...l)).toBeGreaterThan(30);
    expect(new Set(DASH_PATTERNS.slice(0, 6).map((d) => d.join(","))).size).toBe(6);
  });
});
