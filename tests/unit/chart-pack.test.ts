// The chamber chart's packed columns: a round trip gives the points back (values to 0.01), and the
// packed JSON is much smaller than the points' own.
import { describe, expect, it } from "vitest";
import { packChart, unpackChart, type ChartPoint } from "@/lib/climate/chart-pack";

const points: ChartPoint[] = Array.from({ length: 1600 }, (_, i) => ({
  t: Date.UTC(2026, 0, 1) + i * 600_000 + (i % 7 === 0 ? 1000 : 0),
  rh: 30 + Math.sin(i / 20) * 5 + 0.123,
  rhRaw: 30 + Math.sin(i / 20) * 5 + (i > 800 ? 0.9 : 0.123),
  tempC: i % 50 === 0 ? null : 18 + Math.cos(i / 30),
  dewC: i % 50 === 0 ? null : -2 + Math.cos(i / 30),
  dewOver: i % 50 === 0 ? null : i % 3 === 0 ? "ice" : i % 3 === 1 ? "water" : "logged",
  instrument: i < 400 ? "HX-1" : "HX-2",
}));
const r2 = (x: number | null) => (x === null ? null : Math.round(x * 100) / 100);

describe("packed chart points", () => {
  it("unpack gives back every point, times exactly and values to 0.01", () => {
    const back = unpackChart(JSON.parse(JSON.stringify(packChart(points))));
    expect(back).toHaveLength(points.length);
    back.forEach((p, i) => {
      const q = points[i];
      expect(p).toEqual({ t: q.t, rh: r2(q.rh), rhRaw: r2(q.rhRaw), tempC: r2(q.tempC), dewC: r2(q.dewC), dewOver: q.dewOver, instrument: q.instrument });
    });
  });

  it("leaves RH as logged out when no point was corrected, and packs an empty chart", () => {
    const plain = points.map((p) => ({ ...p, rhRaw: p.rh }));
    expect(packChart(plain).rhRaw).toBeNull();
    expect(unpackChart(packChart(plain)).map((p) => p.rhRaw)).toEqual(plain.map((p) => r2(p.rh)));
    expect(unpackChart(packChart([]))).toEqual([]);
  });

  it("is under a third of the points' JSON", () => {
    expect(JSON.stringify(packChart(points)).length).toBeLessThan(JSON.stringify(points).length / 3);
  });
});
