"use client";
// Equilibrium RH of one salt across its fit range (Greenspan 1977), with the chamber's temperature marked.
import { useMemo } from "react";
import { VegaEmbed } from "react-vega";
import type { VisualizationSpec } from "vega-embed";
import { saltEquilibriumRh, saltRhCurve, SALTS, type SaltId } from "@/lib/humidity/salts";
import { EMBED_OPTIONS } from "./vega-embed-options";

export default function SaltCurveChart({ saltId, tempC }: { saltId: SaltId; tempC: number | null }) {
  const spec = useMemo<VisualizationSpec>(() => {
    const [lo, hi] = SALTS[saltId].rangeC;
    const curve = saltRhCurve(saltId, Math.max(0.5, (hi - lo) / 100)).map((p) => ({ tempC: p.tempC, rh: p.rhPercent, lo: p.rhPercent - (p.uncertaintyPercent ?? 0), hi: p.rhPercent + (p.uncertaintyPercent ?? 0) }));
    const marked = tempC !== null && tempC >= lo && tempC <= hi ? [{ tempC, rh: saltEquilibriumRh(saltId, tempC).rhPercent }] : [];
    return {
      $schema: "https://vega.github.io/schema/vega-lite/v6.json",
      width: "container",
      height: 160,
      background: "transparent",
      config: { axis: { labelColor: "#5f6873", titleColor: "#5f6873", gridColor: "#cfd3d744" }, view: { stroke: null } },
      layer: [
        { data: { values: curve }, mark: { type: "area", opacity: 0.25, color: "#3faf99" }, encoding: { x: { field: "tempC", type: "quantitative", title: "Temperature (°C)", scale: { domain: [lo, hi] } }, y: { field: "lo", type: "quantitative", title: "Equilibrium RH (%RH)", scale: { zero: false } }, y2: { field: "hi" } } },
        { data: { values: curve }, mark: { type: "line", color: "#1b7667" }, encoding: { x: { field: "tempC", type: "quantitative" }, y: { field: "rh", type: "quantitative" }, tooltip: [{ field: "tempC", title: "°C", format: ".1f" }, { field: "rh", title: "%RH", format: ".2f" }] } },
        { data: { values: marked }, mark: { type: "point", filled: true, size: 90, color: "#c95b1f" }, encoding: { x: { field: "tempC", type: "quantitative" }, y: { field: "rh", type: "quantitative" } } },
        { data: { values: marked }, mark: { type: "rule", strokeDash: [4, 3], color: "#c95b1f" }, encoding: { x: { field: "tempC", type: "quantitative" } } },
      ],
    };
  }, [saltId, tempC]);
  return <VegaEmbed spec={spec} options={EMBED_OPTIONS} className="w-full" />;
}
