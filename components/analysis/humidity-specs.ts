// vega-lite specs for the humidity response: predicted time until p % rust against RH, and the
// model check (fitted share rusted over the Turnbull estimate, per humidity level).
import type { VisualizationSpec } from "vega-embed";
import type { HumidityResponse } from "@/lib/analysis/humidity-result";
import { categoryScale } from "@/components/ui/chart-palette";
import { BASE } from "./chart-specs";

const colourOf = (domain: readonly string[]) => ({
  field: "group", type: "nominal" as const, title: null,
  scale: categoryScale(domain),
});

export function responseSpec(r: HumidityResponse): VisualizationSpec {
  const domain = r.combos.map((c) => `${c.materialLabel}, ${c.treatmentName}`);
  const values = r.combos.flatMap((c, i) => c.curve.map((p) => ({ group: domain[i], ...p })));
  const x = { field: "rhPercent", type: "quantitative" as const, title: "Relative humidity (%RH, measured mean)", scale: { domain: [0, 100] } };
  const y = { field: "days", type: "quantitative" as const, title: `Days until ${+(r.options.p * 100).toFixed(1)} % have rusted (log scale)`, scale: { type: "log" as const, domain: [1, 1e6], clamp: true } };
  const thresholds = r.combos.filter((c) => c.threshold.rhPercent !== null).map((c, i) => ({ group: `${c.materialLabel}, ${c.treatmentName}`, rhPercent: c.threshold.rhPercent, i }));
  return {
    ...BASE,
    height: 320,
    layer: [
      { data: { values }, mark: { type: "area", fillOpacity: 0.13 }, encoding: { x, y: { ...y, field: "lower95" }, y2: { field: "upper95" }, color: colourOf(domain) } },
      {
        data: { values }, mark: { type: "line", strokeWidth: 2 },
        encoding: {
          x, y, color: { ...colourOf(domain), legend: { orient: "bottom", columns: 2, labelLimit: 320 } },
          tooltip: [{ field: "group" }, { field: "rhPercent", title: "%RH" }, { field: "days", title: "days", format: ",.0f" }, { field: "lower95", title: "95 % low", format: ",.0f" }, { field: "upper95", title: "95 % high", format: ",.0f" }],
        },
      },
      { data: { values: [{ days: r.options.horizonDays }] }, mark: { type: "rule", strokeDash: [6, 4], color: "#4a525c" }, encoding: { y: { field: "days", type: "quantitative" } } },
      { data: { values: [{ days: r.options.horizonDays, label: "horizon" }] }, mark: { type: "text", align: "left", dx: 4, dy: -6, color: "#4a525c" }, encoding: { y: { field: "days", type: "quantitative" }, x: { datum: 1 }, text: { field: "label" } } },
      { data: { values: thresholds }, mark: { type: "rule", strokeDash: [2, 3] }, encoding: { x: { field: "rhPercent", type: "quantitative" }, color: colourOf(domain) } },
    ],
  } as VisualizationSpec;
}

export function modelCheckSpec(r: HumidityResponse): VisualizationSpec {
  const domain = r.check.map((l) => `${l.label} (mean ${l.meanRhPercent.toFixed(1)} %RH)`);
  const observed = r.check.flatMap((l, i) => l.observed.map((p) => ({ group: domain[i], ...p })));
  const fitted = r.check.flatMap((l, i) => l.fitted.map((p) => ({ group: domain[i], ...p })));
  const x = { field: "day", type: "quantitative" as const, title: "Days since the start" };
  const y = { field: "rustedShare", type: "quantitative" as const, title: "Share rusted", scale: { domain: [0, 1] }, axis: { format: ".0%" } };
  return {
    ...BASE,
    height: 280,
    layer: [
      { data: { values: observed }, mark: { type: "line", interpolate: "step-after", strokeWidth: 2 }, encoding: { x, y, color: { ...colourOf(domain), legend: { orient: "bottom", columns: 2, labelLimit: 320 } }, tooltip: [{ field: "group" }, { field: "day", format: ".0f" }, { field: "rustedShare", title: "observed", format: ".0%" }] } },
      { data: { values: fitted }, mark: { type: "line", strokeDash: [5, 3], strokeWidth: 1.5 }, encoding: { x, y, color: colourOf(domain), tooltip: [{ field: "group" }, { field: "day", format: ".0f" }, { field: "rustedShare", title: "fitted", format: ".0%" }] } },
    ],
  } as VisualizationSpec;
}
