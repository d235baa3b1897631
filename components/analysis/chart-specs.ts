// vega-lite specs for the comparison charts, built on the server from the analysis result.
import type { VisualizationSpec } from "vega-embed";
import type { CurveMethod, GroupResult } from "@/lib/analysis/result";
import { categoryScale, dashScale } from "@/components/ui/chart-palette";

/** Up to this many groups share one chart; with more, each group gets its own small panel. */
export const MAX_GROUPS_IN_ONE_CHART = 6;
// Columns of the small multiples: three panels fit the page (and A4) at a readable width.
const PANEL_COLUMNS = 3;
const PANEL_WIDTH = 230;
const PANEL_HEIGHT = 150;
// The other groups, drawn thin and pale behind each panel's own curve, for context.
const CONTEXT_GREY = "#c3c8ce";

const legendOf = (groups: readonly GroupResult[]) => ({
  orient: "bottom" as const, columns: groups.length > 4 ? 2 : groups.length, labelLimit: 320,
  symbolType: "stroke", symbolStrokeWidth: 2.5, symbolSize: 400, symbolOpacity: 1,
});

/**
 * The shared colour encoding; the legend is drawn once, from the layer that asks for it (a layer with
 * `legend: null` would switch it off for all of them). Small multiples need no legend: each panel is named.
 */
function colour(groups: readonly GroupResult[], legend: boolean | null = true) {
  return {
    field: "group",
    type: "nominal" as const,
    title: null,
    scale: categoryScale(groups.map((g) => g.label)),
    ...(legend ? { legend: legendOf(groups) } : legend === null ? { legend: null } : {}),
  };
}

/** Dash pattern per group, in step with the colours; vega-lite merges it into the colour legend. */
function dash(groups: readonly GroupResult[], legend: boolean | null = true) {
  return {
    field: "group",
    type: "nominal" as const,
    title: null,
    scale: dashScale(groups.map((g) => g.label)),
    ...(legend ? { legend: legendOf(groups) } : legend === null ? { legend: null } : {}),
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

type Row = Record<string, unknown> & { group: string };

/** Whether a comparison's charts are drawn as small multiples (one panel per group). */
export function usesSmallMultiples(groups: readonly GroupResult[]): boolean {
  return groups.length > MAX_GROUPS_IN_ONE_CHART;
}

/**
 * One chart from layers over `rows` (each layer filtered by `kind`). With more than six groups, a facet
 * per group: every panel shows its own group in its colour and dash, and the other groups' `line` rows
 * faint behind it.
 */
function build(groups: readonly GroupResult[], rows: Row[], layers: (many: boolean) => object[], contextLine: object): VisualizationSpec {
  if (!usesSmallMultiples(groups)) return { ...BASE, data: { values: rows }, layer: layers(false) } as VisualizationSpec;
  const labels = groups.map((g) => g.label);
  const values = labels.flatMap((panel) => rows
    .filter((r) => r.group === panel || r.kind === "line")
    .map((r) => ({ ...r, panel, own: r.group === panel })));
  const { width: _w, height: _h, ...base } = BASE;
  return {
    ...base,
    data: { values },
    columns: PANEL_COLUMNS,
    facet: { field: "panel", type: "nominal", title: null, sort: labels, header: {
      labelFontSize: 12, labelFontWeight: 600, labelLimit: PANEL_WIDTH + 40,
      // Arm names ("Jar A · … / Uncoated control") break at the slash so the whole name fits over the panel.
      labelExpr: "split(datum.label, ' / ')",
    } },
    spec: {
      width: PANEL_WIDTH,
      height: PANEL_HEIGHT,
      layer: [
        { transform: [{ filter: "datum.kind === 'line' && !datum.own" }], ...contextLine },
        ...layers(true).map((l) => ({ ...l, transform: [{ filter: "datum.own" }, ...((l as { transform?: object[] }).transform ?? [])] })),
      ],
    },
  } as VisualizationSpec;
}

export function survivalSpec(groups: readonly GroupResult[], method: CurveMethod): VisualizationSpec {
  const curves = groups.flatMap((g) => (method === "km" ? g.km : g.turnbull).points.map((p) => ({ kind: "line", group: g.label, ...p })));
  const marks = groups.flatMap((g) => (method === "km" ? g.km : g.turnbull).censorMarks.map((m) => ({ kind: "mark", group: g.label, ...m })));
  const x = { field: "time", type: "quantitative" as const, title: "Days since the trial start", scale: { zero: true } };
  const y = { field: "survival", type: "quantitative" as const, title: "Rust-free fraction", scale: { domain: [0, 1] }, axis: { format: ".0%" } };
  const only = (kind: string) => [{ filter: `datum.kind === '${kind}'` }];
  const layers = (many: boolean) => {
    const layer: object[] = [];
    // Bands use fillOpacity: a layer with `opacity` would fade the shared legend too.
    if (method === "km") {
      layer.push({
        transform: only("line"),
        mark: { type: "area", interpolate: "step-after", fillOpacity: 0.14 },
        encoding: { x, y: { ...y, field: "lower" }, y2: { field: "upper" }, color: colour(groups, many ? null : false) },
      });
    }
    layer.push({
      transform: only("line"),
      mark: { type: "line", interpolate: "step-after", strokeWidth: 2.25 },
      encoding: {
        x, y, color: colour(groups, many ? null : true), strokeDash: dash(groups, many ? null : true),
        tooltip: [{ field: "group" }, { field: "time", title: "day", format: ".1f" }, { field: "survival", title: "rust-free", format: ".0%" }],
      },
    });
    layer.push({
      transform: only("mark"),
      mark: { type: "point", shape: "cross", size: 80, filled: true, strokeWidth: 0, opacity: 1 },
      encoding: {
        x, y, color: colour(groups, many ? null : false),
        tooltip: [{ field: "group" }, { field: "time", title: "censored at day", format: ".1f" }, { field: "count", title: "specimens" }],
      },
    });
    return layer;
  };
  const context = {
    mark: { type: "line", interpolate: "step-after", strokeWidth: 1, color: CONTEXT_GREY },
    encoding: { x, y, detail: { field: "group", type: "nominal" } },
  };
  return build(groups, [...curves, ...marks], layers, context);
}

const AREA_TITLE = "Rusted area, % of face (median; band: IQR)";

export function areaSpec(groups: readonly GroupResult[]): VisualizationSpec {
  const rows = groups.flatMap((g) => g.area.map((p) => ({ kind: "line", group: g.label, ...p })));
  const x = { field: "day", type: "quantitative" as const, title: "Days since the trial start" };
  const layers = (many: boolean) => [
    {
      mark: { type: "area", fillOpacity: 0.14 },
      encoding: { x, y: { field: "q1", type: "quantitative", title: AREA_TITLE }, y2: { field: "q3" }, color: colour(groups, many ? null : false) },
    },
    {
      mark: { type: "line", point: true, strokeWidth: 2.25 },
      encoding: {
        x,
        y: { field: "median", type: "quantitative", title: AREA_TITLE },
        color: colour(groups, many ? null : true),
        strokeDash: dash(groups, many ? null : true),
        tooltip: [
          { field: "group" }, { field: "day", format: ".1f" }, { field: "n", title: "specimens" },
          { field: "median", format: ".3f" }, { field: "q1", title: "25th pct", format: ".3f" }, { field: "q3", title: "75th pct", format: ".3f" },
        ],
      },
    },
  ];
  const context = {
    mark: { type: "line", strokeWidth: 1, color: CONTEXT_GREY },
    encoding: { x, y: { field: "median", type: "quantitative", title: AREA_TITLE }, detail: { field: "group", type: "nominal" } },
  };
  return build(groups, rows, layers, context);
}
