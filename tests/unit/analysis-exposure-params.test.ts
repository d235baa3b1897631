import { describe, expect, it } from "vitest";
import { exposureApiQuery, exposureQuery } from "@/lib/analysis/params";
import { exposureKeep } from "@/lib/analysis/exposure-params";

describe("exposure choices in the comparison URL", () => {
  it("reads thresholds and the out-of-band share, and defaults without them", () => {
    // Defaults: 25 %RH (Watkinson & Lewis 2005) and 60 %RH (Watkinson, Rimmer & Emmerson 2019).
    expect(exposureQuery({}).value).toEqual({ thresholdsRhPercent: [25, 60], maxOutOfBandPercent: null });
    expect(exposureQuery({ above: "60,40,60", outOfBandMax: "12.5" })).toEqual({ value: { thresholdsRhPercent: [40, 60], maxOutOfBandPercent: 12.5 }, errors: {} });
    expect(exposureKeep({ thresholdsRhPercent: [25, 60], maxOutOfBandPercent: null })).toEqual({});
    expect(exposureKeep({ thresholdsRhPercent: [40], maxOutOfBandPercent: 10 })).toEqual({ above: "40", outOfBandMax: "10" });
  });

  it("names a threshold or share out of range, keeping the default for it", () => {
    for (const above of ["120", "-1", "abc", "10,,20", "1,2,3,4,5,6"]) {
      const r = exposureQuery({ above });
      expect(r.errors.above?.[0]).toMatch(/0 to 100 %RH/);
      expect(r.value.thresholdsRhPercent).toEqual([25, 60]);
    }
    for (const outOfBandMax of ["101", "-5", "ten"]) {
      const r = exposureQuery({ outOfBandMax });
      expect(r.errors.outOfBandMax?.[0]).toMatch(/0 to 100 %/);
      expect(r.value.maxOutOfBandPercent).toBeNull();
    }
    expect(() => exposureApiQuery(new URLSearchParams("outOfBandMax=150"))).toThrow(/0 to 100/);
  });
});
