// vega-lite specs for the comparison charts, built on the server from the analysis result.
import type { VisualizationSpec } from "vega-embed";
import type { CurveMethod, GroupResult } from "@/lib/analysis/result";
import { categoryScale } from "@/components/ui/chart-palette";

/** The shared colour encoding; the legend is drawn once, from the layer that asks for it. */
function colour(groups: readonly GroupResult[], legend = true) {
  return {
    field: "group",
    type: "nominal" as const,
    title: null,
    scale: categoryScale(groups.map((g) => g.label)),
    // Layers share one legend; a layer with `legend: null` would switch it off for all of them.
    ...(legend ? { legend: { orient: "bottom" as const, columns: groups.length > 4 ? 2 : groups.length, labelLimit: 320, symbolType: "stroke", symbolStrokeWidth: 3, symbolOpacity: 1 } } : {}),
  };
}

export const BASE = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  width: "container",
  height: 300,
  background: "#ffffff",
  padding: 8,
  config: { font: "IBM Plex Sans, system-ui, sans-serif", axis: { labelFontSize: 11, titleFontSize: 12 }, legend: { labelFontSize: 11 } },
} as const;

export function survivalSpec(groups: readonly GroupResult[], method: CurveMethod): VisualizationSpec {
  const curves = groups.flatMap((g) => (method === "km" ? g.km : g.turnbull).points.map((p) => ({ group: g.label, ...p })));
  const marks = groups.flatMap((g) => (method === "km" ? g.km : g.turnbull).censorMarks.map((m) => ({ group: g.label, ...m })));
  const x = { field: "time", type: "quantitative" as const, title: "Days since the trial start", scale: { zero: true } };
  const y = { field: "survival", type: "quantitative" as const, title: "Rust-free fraction", scale: { domain: [0, 1] }, axis: { format: ".0%" } };
  const layer: object[] = [];
  // Bands use fillOpacity: a layer with `opacity` would fade the shared legend too.
  if (method === "km") {
    layer.push({
      data: { values: curves },
      mark: { type: "area", interpolate: "step-after", fillOpacity: 0.14 },
      encoding: { x, y: { ...y, field: "lower" }, y2: { field: "upper" }, color: colour(groups, false) },
    });
  }
  layer.push({
    data: { values: curves },
    mark: { type: "line", interpolate: "step-after", strokeWidth: 2 },
    encoding: {
      x, y, color: colour(groups),
      tooltip: [{ field: "group" }, { field: "time", title: "day", format: ".1f" }, { field: "survival", title: "rust-free", format: ".0%" }],
    },
  });
  layer.push({
    data: { values: marks },
    mark: { type: "point", shape: "cross", size: 80, filled: true, strokeWidth: 0, opacity: 1 },
    encoding: {
      x, y, color: colour(groups, false),
      tooltip: [{ field: "group" }, { field: "time", title: "censored at day", format: ".1f" }, { field: "count", title: "specimens" }],
    },
  });
  return { ...BASE, layer } as VisualizationSpec;
}

const AREA_TITLE = "Rusted area, % of face (median; band: IQR)";

export function areaSpec(groups: readonly GroupResult[]): VisualizationSpec {
  const values = groups.flatMap((g) => g.area.map((p) => ({ group: g.label, ...p })));
  const x = { field: "day", type: "quantitative" as const, title: "Days since the trial start" };
  return {
    ...BASE,
    data: { values },
    layer: [
      {
        mark: { type: "area", fillOpacity: 0.14 },
        encoding: { x, y: { field: "q1", type: "quantitative", title: AREA_TITLE }, y2: { field: "q3" }, color: colour(groups, false) },
      },
      {
        mark: { type: "line", point: true, strokeWidth: 2 },
        encoding: {
          x,
          y: { field: "median", type: "quantitative", title: AREA_TITLE },
          color: colour(groups),
          tooltip: [
            { field: "group" }, { field: "day", format: ".1f" }, { field: "n", title: "specimens" },
            { field: "median", format: ".3f" }, { field: "q1", title: "25th pct", format: ".3f" }, { field: "q3", title: "75th pct", format: ".3f" },
          ],
        },
      },
    ],
  } as VisualizationSpec;
}
