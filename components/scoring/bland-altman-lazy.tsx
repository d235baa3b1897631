"use client";
import dynamic from "next/dynamic";

// Vega is heavy: load it only when the agreement page shows a chart, and only in the browser.
export const BlandAltmanLazy = dynamic(() => import("./bland-altman-chart"), {
  ssr: false,
  loading: () => <p role="status" className="text-sm muted">Loading the chart…</p>,
});
