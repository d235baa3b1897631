// The chamber chart's hygrometer corrections: the same drift rule as exposure (hygrometer-check
// correctionAt), and which block summaries may stand for their readings under it. Reference values
// are recomputed by hand below (linear interpolation in time of offset corrections).
import { describe, expect, it } from "vitest";
import { applyOffsets, OffsetsUsed, OffsetTimeline } from "@/lib/climate/check-timeline";
import { applyCorrection } from "@/lib/climate/hygrometer-check";
import type { OffsetCheck } from "@/lib/climate/check-timeline";
import type { Row } from "@/lib/climate/readings-reduce";

const MIN = 60_000;
const check = (id: string, instrument: string, offsetRhPercent: number, atMin: number, applied = true): OffsetCheck => ({
  id, instrument, offsetRhPercent, checkedAt: new Date(atMin * MIN), saltId: "NaCl", applied, readingRhPercent: 75 + offsetRhPercent, referenceRhPercent: 75, slope: null,
});
// probe-a reads 2 high at minute 100 and 2 low at minute 200; a check at 150 is not applied.
// probe-b reads 1 high at minutes 100 and 300 (no drift between them).
const timeline = new OffsetTimeline([
  check("a1", "probe-a", 2, 100), check("a2", "probe-a", -2, 200), check("ax", "probe-a", 9, 150, false),
  check("b1", "probe-b", 1, 100), check("b2", "probe-b", 1, 300),
]);

describe("hygrometer corrections on the chamber chart", () => {
  it("interpolates drift between checks and holds the nearest outside them", () => {
    // By hand: at minute 125 the offset is 2 + 0.25 × (−2 − 2) = 1, so 50 reads as 49.
    expect(applyCorrection(50, timeline.at("probe-a", 125 * MIN))).toBe(49);
    expect(applyCorrection(50, timeline.at("probe-a", 0))).toBe(48); // before the first: held
    expect(applyCorrection(50, timeline.at("probe-a", 500 * MIN))).toBe(52); // after the last: held
    expect(timeline.at("probe-c", 0)).toBeNull();
  });

  it("lets a block stand for its readings only under one correction", () => {
    expect(timeline.over("probe-a", 0, 100 * MIN)).toEqual({ gain: 1, shiftRhPercent: -2 }); // wholly before the first check
    expect(timeline.over("probe-a", 200 * MIN, 260 * MIN)).toEqual({ gain: 1, shiftRhPercent: 2 }); // from the last check on
    expect(timeline.over("probe-a", 120 * MIN, 180 * MIN)).toBe("varies"); // between checks that differ
    expect(timeline.over("probe-a", 60 * MIN, 120 * MIN)).toBe("varies"); // a check inside
    expect(timeline.over("probe-b", 120 * MIN, 180 * MIN)).toEqual({ gain: 1, shiftRhPercent: -1 }); // between equal checks
    expect(timeline.over("probe-c", 0, 60 * MIN)).toBeNull();
    expect(() => timeline.constantOver("probe-a", 120 * MIN, 180 * MIN)).toThrow(/varies/);
  });

  it("names the checks used the same way whether readings come one by one or as block spans", () => {
    const rows: Row[] = [20, 130, 140, 250].map((m) => ({ takenAt: new Date(m * MIN), rhPercent: 50, rhRaw: 50, tempC: null, dewLogged: null, instrument: "probe-a" }));
    const fromRows = applyOffsets(rows, timeline);
    expect(rows.map((r) => r.rhPercent)).toEqual([48, 49.2, 49.6, 52]); // by hand: offsets 2, 0.8, 0.4, −2
    const spans = new OffsetsUsed();
    spans.note("probe-a", 20 * MIN, 140 * MIN);
    spans.note("probe-a", 250 * MIN);
    expect(spans.list(timeline)).toEqual(fromRows);
    expect(fromRows.map((o) => [o.instrument, o.offsetPercent])).toEqual([["probe-a", 2], ["probe-a", -2]]);
    const early = new OffsetsUsed();
    early.note("probe-a", 0, 90 * MIN);
    expect(early.list(timeline).map((o) => o.offsetPercent)).toEqual([2]);
  });
});
