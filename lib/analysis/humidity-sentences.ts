// The humidity response in words: the threshold sentence a storage rule keeps, and the horizon.
import type { ResponseOptions, Threshold } from "./humidity-result";

export const fmtRh = (v: number) => `${Math.round(v)} %RH`;

export function formatHorizon(days: number): string {
  const years = days / 365.25;
  return years >= 1 && Math.abs(years - Math.round(years)) < 0.01
    ? `${Math.round(years)} year${Math.round(years) === 1 ? "" : "s"}`
    : `${Math.round(days).toLocaleString("en-GB")} days`;
}

/** "Keep bare iron meteorites below 28 %RH (95 % CI 19–35 %RH) …" */
export function thresholdSentence(t: Threshold, who: string, options: ResponseOptions): string {
  const pct = `${+(options.p * 100).toFixed(1)} %`;
  const horizon = formatHorizon(options.horizonDays);
  switch (t.status) {
    case "found": {
      const ci = t.lower95 !== null && t.upper95 !== null ? `${Math.round(t.lower95)}–${fmtRh(t.upper95)}`
        : t.lower95 !== null ? `${fmtRh(t.lower95)} or more` : t.upper95 !== null ? `up to ${fmtRh(t.upper95)}` : "not bounded within 0–100 %RH";
      return `Keep ${who} below ${fmtRh(t.rhPercent!)} (95 % CI ${ci}) so that fewer than ${pct} rust within ${horizon}.`;
    }
    case "no-trend":
      return `For ${who} the fit does not show rust coming sooner at higher humidity, so no storage threshold follows from these data.`;
    case "above-range":
      return `For ${who} the model predicts fewer than ${pct} rusted within ${horizon} even at 100 %RH: the data set no limit below saturation.`;
    case "below-range":
      return `For ${who} the model predicts ${pct} rusted within ${horizon} even at 0 %RH: no humidity alone keeps them that long.`;
  }
}

export function whoOf(materialLabel: string, treatment: { name: string; kind: string }): string {
  const material = materialLabel.toLowerCase();
  const plural = material.endsWith("iron") ? `${material} specimens` : `${material}s`;
  return treatment.kind === "control" ? `${plural} (${treatment.name.toLowerCase()})` : `${plural} treated with ${treatment.name.toLowerCase()}`;
}
