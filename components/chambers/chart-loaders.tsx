"use client";
// The charting libraries load only on pages that chart, in the browser (next/dynamic, ssr: false).
import dynamic from "next/dynamic";

const loading = () => <p className="text-sm muted" role="status">Loading chart…</p>;

export const ClimateChartLoader = dynamic(() => import("./climate-chart"), { ssr: false, loading });
export const SaltCurveChartLoader = dynamic(() => import("./salt-curve-chart"), { ssr: false, loading });
