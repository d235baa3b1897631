"use client";
// Bland–Altman scatter for one pair of scorers: difference against mean of their area %, with the
// bias and 95 % limits of agreement as rules. Loaded only on the agreement page (next/dynamic).
import { VegaEmbed } from "react-vega";
import { expressionInterpreter } from "vega-interpreter";
import type { VisualizationSpec } from "vega-embed";

type Props = { title: string; points: { mean: number; diff: number }[]; bias: number; lower: number; upper: number };

export default function BlandAltmanChart({ title, points, bias, lower, upper }: Props) {
  const lines = [
    { y: upper, label: `upper limit ${upper.toFixed(3)}` },
    { y: bias, label: `bias ${bias.toFixed(3)}` },
    { y: lower, label: `lower limit ${lower.toFixed(3)}` },
  ];
  const spec: VisualizationSpec = {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    width: "container",
    height: 260,
    title,
    layer: [
      {
        data: { values: points },
        mark: { type: "point", filled: true, opacity: 0.6, color: "#1b7667" },
        encoding: {
          x: { field: "mean", type: "quantitative", title: "Mean of the two scorers' area (%)" },
          y: { field: "diff", type: "quantitative", title: "Difference in area (percentage points)" },
          tooltip: [{ field: "mean", format: ".3f", title: "mean %" }, { field: "diff", format: ".3f", title: "difference" }],
        },
      },
      {
        data: { values: lines },
        mark: { type: "rule", strokeDash: [6, 4], color: "#a84618" },
        encoding: { y: { field: "y", type: "quantitative" } },
      },
      {
        data: { values: lines },
        mark: { type: "text", align: "right", dx: -4, dy: -6, color: "#a84618", fontSize: 11 },
        encoding: { y: { field: "y", type: "quantitative" }, x: { value: "width" }, text: { field: "label" } },
      },
    ],
  };
  // The interpreter keeps Vega from compiling expressions with Function(), which the CSP forbids.
  return <VegaEmbed spec={spec} options={{ actions: false, ast: true, expr: expressionInterpreter, renderer: "svg" }} className="w-full" />;
}
