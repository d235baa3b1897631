"use client";
// The one place react-vega is loaded, on demand and in the browser only: pages that do not chart
// never download vega. Specs come from the server as plain JSON.
import dynamic from "next/dynamic";
import type { VisualizationSpec } from "vega-embed";

const VegaEmbed = dynamic(() => import("react-vega").then((m) => m.VegaEmbed), {
  ssr: false,
  loading: () => <p className="text-sm muted p-4">Drawing the chart…</p>,
});

// ast: expressions run through vega's interpreter, so the chart works under our CSP (no eval).
// No actions menu: its icon-only control has no accessible name, and the data export is ours.
const OPTIONS = { renderer: "svg" as const, ast: true, actions: false };

export function VegaChart({ spec, label, testId }: { spec: VisualizationSpec; label: string; testId?: string }) {
  // vega writes `description` onto the SVG as its accessible name.
  const described = { ...spec, description: label } as VisualizationSpec;
  return (
    <div data-testid={testId} className="w-full overflow-x-auto">
      <VegaEmbed spec={described} options={OPTIONS} style={{ width: "100%" }} />
    </div>
  );
}
