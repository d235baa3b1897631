"use client";
// RH over time against the target band (top) and temperature with dew or frost point (bottom). The points
// arrive already thinned on the server (min/max per bucket), so spikes survive.
import { useEffect, useMemo, useRef, useState } from "react";
import { VegaEmbed } from "react-vega";
import type { VisualizationSpec } from "vega-embed";
import { categoryScale } from "@/components/ui/chart-palette";
import { EMBED_OPTIONS } from "./vega-embed-options";

import { unpackChart, type PackedChart } from "@/lib/climate/chart-pack";

/** Series names: a computed value says which saturation it is over; a logged one is the logger's. */
export const DEW_SERIES = { water: "Dew point (over water)", ice: "Frost point (over ice, below 0 °C)", logged: "Dew point (as logged)" } as const;
const TEMP_DOMAIN = ["Temperature", DEW_SERIES.water, DEW_SERIES.ice, DEW_SERIES.logged];
const TEMP_RANGE = ["#c95b1f", "#4a6fa5", "#6b4aa5", "#5f6873"];

const AXIS = { labelColor: "#5f6873", titleColor: "#5f6873", gridColor: "#cfd3d744" };

export default function ClimateChart({ packed, band, corrected }: { packed: PackedChart; band: { minRh: number; maxRh: number }; corrected: boolean }) {
  const points = useMemo(() => unpackChart(packed), [packed]);
  // Concatenated views cannot size to their container, so measure it (leaving room for the y axis).
  const box = useRef<HTMLDivElement>(null);
  const [boxWidth, setBoxWidth] = useState(0);
  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const ro = new ResizeObserver(([entry]) => setBoxWidth(Math.floor(entry.contentRect.width / 20) * 20));
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
  const width = Math.max(240, boxWidth - 80);
  const spec = useMemo<VisualizationSpec>(() => {
    const instruments = [...new Set(points.map((p) => p.instrument))].sort((a, b) => a.localeCompare(b, "en"));
    const several = instruments.length > 1;
    const label = (t: number) => `${new Date(t).toISOString().slice(0, 16).replace("T", " ")} UTC`;
    const rhPoints = points.map((p) => ({ ...p, time: label(p.t) }));
    const temps = points.flatMap((p) => [
      ...(p.tempC == null ? [] : [{ t: p.t, time: label(p.t), series: "Temperature", c: p.tempC }]),
      ...(p.dewC == null || p.dewOver == null ? [] : [{ t: p.t, time: label(p.t), series: DEW_SERIES[p.dewOver], c: p.dewC }]),
    ]);
    // Only the series present get a legend entry (a warm chamber never shows the frost point).
    const shown = TEMP_DOMAIN.map((_, i) => i).filter((i) => i === 0 || temps.some((p) => p.series === TEMP_DOMAIN[i]));
    const x = { field: "t", type: "temporal" as const, scale: { type: "utc" as const }, title: "Time (UTC)", axis: { format: "%d %b %H:%M", labelAngle: 0, tickCount: 6 } };
    const rhTooltip = [
      { field: "time", title: "Time" },
      { field: "rh", title: corrected ? "RH, corrected (%RH)" : "RH (%RH)", format: ".1f" },
      ...(corrected ? [{ field: "rhRaw", title: "RH as logged (%RH)", format: ".1f" }] : []),
      { field: "instrument", title: "Instrument" },
    ];
    return {
      $schema: "https://vega.github.io/schema/vega-lite/v6.json",
      background: "transparent",
      config: { axis: AXIS, legend: { labelColor: "#5f6873", titleColor: "#5f6873", orient: "top" }, view: { stroke: null } },
      // Instruments (top) and temperature/dew point (bottom) are different colour keys.
      resolve: { scale: { color: "independent" }, legend: { color: "independent" } },
      vconcat: [
        {
          width,
          height: 240,
          title: { text: "Relative humidity", anchor: "start", color: "#5f6873", fontSize: 12 },
          layer: [
            { data: { values: [band] }, mark: { type: "rect", color: "#3faf99", opacity: 0.18 }, encoding: { y: { field: "minRh", type: "quantitative" }, y2: { field: "maxRh" } } },
            {
              data: { values: rhPoints },
              mark: { type: "line", strokeWidth: 1.3, interpolate: "step-after" },
              encoding: {
                x,
                y: { field: "rh", type: "quantitative", title: "RH (%RH)", scale: { zero: false } },
                ...(several ? { color: { field: "instrument", type: "nominal" as const, title: "Instrument", scale: categoryScale(instruments) } } : { color: { value: "#1b7667" } }),
                tooltip: rhTooltip,
              },
            },
          ],
        },
        {
          width,
          height: 150,
          title: { text: "Temperature and dew point (frost point below 0 °C)", anchor: "start", color: "#5f6873", fontSize: 12 },
          data: { values: temps },
          mark: { type: "line", strokeWidth: 1.2 },
          encoding: {
            x,
            y: { field: "c", type: "quantitative", title: "°C", scale: { zero: false } },
            color: { field: "series", type: "nominal", title: null, scale: { domain: shown.map((i) => TEMP_DOMAIN[i]), range: shown.map((i) => TEMP_RANGE[i]) } },
            tooltip: [{ field: "time", title: "Time" }, { field: "series", title: "Series" }, { field: "c", title: "°C", format: ".1f" }],
          },
        },
      ],
    } as VisualizationSpec;
  }, [points, band, corrected, width]);
  return <div ref={box} className="w-full min-w-0">{boxWidth > 0 && <VegaEmbed spec={spec} options={EMBED_OPTIONS} />}</div>;
}
