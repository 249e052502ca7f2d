"use client";
import dynamic from "next/dynamic";

/** Vega is ~290 kB gzipped: the chart loads only in the browser, after the page. */
export const PanelChartLazy = dynamic(() => import("./panel-chart").then((m) => m.PanelChart), {
  ssr: false,
  loading: () => <div className="h-40 w-full animate-pulse rounded-sm bg-paper" aria-hidden />,
});
