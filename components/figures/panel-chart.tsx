"use client";
import { useQuery } from "@tanstack/react-query";
import { useEffect, useId, useMemo, useRef, useState } from "react";
import type { Result } from "vega-embed";
import embed from "vega-embed";
import { expressionInterpreter } from "vega-interpreter";
import { fetchJson } from "@/components/api-client";
import { axisTitlesOf, describeChart } from "@/lib/figures/describe-chart";
import { queryKeys, type BoundRows, type RevisionData, type ThreadAnchor } from "./api";
import { ChartAnchors, focusThread, type ChartAnchor, type PickMode } from "./chart-anchors";
import { DataWarningList, NOTHING_DRAWN, previewWarnings } from "./data-warnings";
import {
  dataMarkItems,
  dataNamesOf,
  plotGeometry,
  prepareSpec,
  PX_PER_MM,
  refusalOf,
  refusingLoader,
  shippedFontFamily,
  svgNaturalSize,
  type PlotGeometry,
} from "./vega-render";

export interface PanelChartProps {
  spec: unknown;
  /** Rows per data name; when absent, the rows of `revisionId` are fetched. */
  data?: Record<string, BoundRows>;
  revisionId?: string | null;
  /** Printed width of the panel, mm. */
  widthMm: number;
  /** 1 = print size at 96 CSS px per inch. */
  zoom?: number;
  anchors?: ChartAnchor[];
  pickMode?: PickMode;
  onPick?: (anchor: ThreadAnchor) => void;
  /** A thread's mark was activated (click, Enter, Space); by default its thread in the review column gets focus. */
  onSelectAnchor?: (anchor: ChartAnchor) => void;
  /** Fitted values the plot shows, formatted ("T2 = 12.3 ± 0.4 µs"), for the text alternative. */
  fitSummary?: string[];
  /** Accessible name of the rendered figure; the chart's own name (title, or what it plots) follows it. */
  label?: string;
  className?: string;
}

interface Rendered {
  natural: { width: number; height: number };
  geometry: PlotGeometry | null;
}

/**
 * A panel's Vega-Lite spec rendered in the browser at its printed size, with bound data only
 * (the loader refuses every load), expressions through the CSP-safe interpreter, and review
 * anchors drawn over the plot. Specs the pure rules refuse (lib/figures/spec-security: display
 * options in usermeta, settings past the budget) are not drawn; the rest go through prepareSpec,
 * which drops usermeta, so vega-embed only sees the options below. Load it with next/dynamic
 * (ssr: false): Vega is large. For assistive technology the drawing is one image, named and
 * described from the spec and the rows (lib/figures/describe-chart); Vega's SVG is hidden from it.
 */
export function PanelChart({
  spec,
  data,
  revisionId,
  widthMm,
  zoom = 1,
  anchors = [],
  pickMode = "none",
  onPick,
  onSelectAnchor,
  fitSummary,
  label,
  className = "",
}: PanelChartProps) {
  const fetched = useQuery({
    queryKey: queryKeys.revisionData(revisionId ?? ""),
    queryFn: () => fetchJson<RevisionData>(`/api/revisions/${revisionId}/data`),
    enabled: !data && Boolean(revisionId),
    staleTime: Infinity,
  });
  const rows = data ?? fetched.data?.data;
  const host = useRef<HTMLDivElement>(null);
  const [drawn, setRendered] = useState<Rendered | null>(null);
  const [renderError, setError] = useState<string | null>(null);
  const [drewNothing, setDrewNothing] = useState(false);
  const specKey = useMemo(() => JSON.stringify(spec ?? null), [spec]);
  const names = useMemo(() => dataNamesOf(JSON.parse(specKey)), [specKey]);
  const ready = Boolean(rows) || names.length === 0;
  // Client-side budget and rules, on the spec as stored (bound rows are not inline data): a refused spec is not drawn.
  const refusal = useMemo(() => {
    const parsed = JSON.parse(specKey) as unknown;
    if (!parsed || typeof parsed !== "object" || Array.isArray(parsed)) return "The spec is not a JSON object.";
    return refusalOf(parsed as Record<string, unknown>);
  }, [specKey]);

  useEffect(() => {
    if (refusal || !ready || !host.current) return;
    const parsed = JSON.parse(specKey) as Record<string, unknown>;
    let cancelled = false;
    let result: Result | null = null;
    const refusals: string[] = [];
    // Bound rows go in as named datasets, so the first layout (axes, autosize) already sees the data.
    const withData = {
      ...parsed,
      datasets: { ...((parsed as { datasets?: object }).datasets ?? {}), ...Object.fromEntries(names.map((n) => [n, rows?.[n]?.rows ?? []])) },
    };
    const prepared = prepareSpec(withData, widthMm, shippedFontFamily());
    void (async () => {
      try {
        result = await embed(host.current!, prepared, {
          mode: "vega-lite",
          renderer: "svg",
          actions: false,
          tooltip: false,
          defaultStyle: false,
          logLevel: 0,
          ast: true,
          expr: expressionInterpreter,
          loader: refusingLoader(refusals),
        });
        if (cancelled) return result.finalize();
        await result.view.runAsync();
        if (refusals.length) throw new Error(`the spec tried to load external resources, which is not allowed (${refusals.slice(0, 2).join("; ")})`);
        const svg = host.current?.querySelector("svg");
        if (!cancelled && svg) {
          setError(null);
          setRendered({ natural: svgNaturalSize(svg), geometry: plotGeometry(result.view) });
          setDrewNothing(dataMarkItems(result.view) === 0);
        }
      } catch (e) {
        if (!cancelled) {
          setError((e as Error).message);
          setRendered(null);
          setDrewNothing(false);
        }
      }
    })();
    return () => {
      cancelled = true;
      result?.finalize();
    };
  }, [specKey, refusal, names, widthMm, ready, rows]);

  const error = refusal ?? renderError;
  const rendered = refusal ? null : drawn;
  const targetPx = widthMm * PX_PER_MM * zoom;
  const scale = rendered ? targetPx / rendered.natural.width : 1;
  const heightPx = rendered ? rendered.natural.height * scale : undefined;
  useEffect(() => {
    const svg = host.current?.querySelector("svg");
    if (!svg || !rendered) return;
    svg.style.width = `${targetPx}px`;
    svg.style.height = `${heightPx}px`;
    svg.style.display = "block";
  }, [rendered, targetPx, heightPx]);

  // Data warnings: the server's for a stored revision; the same checks on the rows for a preview; the browser's "nothing drawn".
  const warnings = useMemo(() => {
    if (data) return previewWarnings(JSON.parse(specKey), data);
    return fetched.data?.warnings ?? [];
  }, [data, specKey, fetched.data]);
  const shownWarnings = drewNothing && rendered && !error && !warnings.some((w) => w.message.startsWith("Nothing")) ? [...warnings, NOTHING_DRAWN] : warnings;
  const reduced = Object.entries(rows ?? {}).filter(([, v]) => v.reduced);
  const missing = rows ? names.filter((n) => !rows[n]) : [];
  const descriptionId = `chart-description-${useId().replace(/[^a-zA-Z0-9_-]/g, "")}`;
  const text = useMemo(() => {
    const counts = Object.fromEntries(Object.entries(rows ?? {}).map(([n, v]) => [n, v.rows.length]));
    return describeChart(JSON.parse(specKey), counts, fitSummary);
  }, [specKey, rows, fitSummary]);
  const axes = useMemo(() => axisTitlesOf(JSON.parse(specKey)), [specKey]);
  return (
    <figure className={`m-0 ${className}`} aria-label={label} data-testid="panel-chart">
      <DataWarningList warnings={shownWarnings} className="mb-1" />
      <div className="relative bg-white" style={{ width: targetPx, minHeight: rendered ? heightPx : 80 }}>
        <div
          role="img"
          aria-label={label ? `${label}: ${text.name}` : text.name}
          aria-describedby={descriptionId}
          aria-busy={!rendered && !error}
          className={error ? "hidden" : ""}
          data-testid="panel-chart-image"
        >
          {/* Vega's SVG is hidden: the image is read as its name and the description below, not mark by mark. */}
          <div ref={host} aria-hidden />
        </div>
        {!rendered && !error ? <div className="absolute inset-0 animate-pulse bg-paper" aria-hidden /> : null}
        {rendered?.geometry && !error ? (
          <ChartAnchors
            geometry={rendered.geometry}
            scale={scale}
            width={targetPx}
            height={heightPx ?? 0}
            anchors={anchors}
            pickMode={pickMode}
            onPick={onPick}
            onSelect={onSelectAnchor ?? focusThread}
            axes={axes}
          />
        ) : null}
        {error ? (
          <p role="alert" className="p-3 text-sm text-bad">
            <span aria-hidden>✕ </span>This spec cannot be drawn: {error}
          </p>
        ) : null}
      </div>
      <p id={descriptionId} className="sr-only">
        {text.description}
      </p>
      {fetched.isError ? (
        <p role="alert" className="mt-1 text-xs text-bad">
          ✕ {fetched.error.message}
        </p>
      ) : null}
      {missing.length ? (
        <p className="mt-1 text-xs text-warn">
          <span aria-hidden>△ </span>No data bound to {missing.map((n) => `“${n}”`).join(", ")}
        </p>
      ) : null}
      {reduced.length ? (
        <figcaption className="mt-1 text-xs text-muted" data-testid="reduced-note">
          <span aria-hidden>◇ </span>reduced for display:{" "}
          {reduced.map(([n, v]) => `${n} ${v.rows.length.toLocaleString("en")} of ${v.sourceRows.toLocaleString("en")} rows`).join(", ")} — exports use every
          row
        </figcaption>
      ) : null}
    </figure>
  );
}
