"use client";
import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useEffect, useMemo, useRef, useState } from "react";
import { fetchJson } from "@/components/api-client";
import { queryKeys, type FigurePanel, type FigureView, type RevisionView } from "@/components/figures/api";
import { GUTTER_MM, panelWidthMm } from "@/components/figures/format";
import { PanelChartLazy } from "@/components/figures/panel-chart-lazy";
import { OpenThreads, ReviewStateBadge } from "@/components/figures/review-state";
import { PX_PER_MM } from "@/components/figures/vega-render";
import { applyHouseStyle, HOUSE_FONTS, panelLetter } from "@/lib/figures/house-style";
import { withoutYTitle } from "@/lib/figures/shared-titles";
import { MmRuler } from "./mm-ruler";
import { useSharedYTitles } from "./use-shared-y-titles";
import { usePrintedAt } from "./use-printing";

const ZOOMS = { min: 50, max: 200, step: 10 };

/** The figure at print size (96 CSS px per inch at 100 %), with mm rulers and zoom; panels on the figure's grid. */
export function FigureCanvas({ figure }: { figure: FigureView }) {
  const [zoomPct, setZoomPct] = useState(100);
  // Printed, the figure is always at its true size (the print stylesheet hides rulers and controls).
  const zoom = usePrintedAt() !== null ? 1 : zoomPct / 100;
  const perMm = PX_PER_MM * zoom;
  const content = useRef<HTMLDivElement>(null);
  const [contentMm, setContentMm] = useState(0);
  useEffect(() => {
    const el = content.current;
    if (!el) return;
    const ro = new ResizeObserver(() => setContentMm(el.offsetHeight / perMm));
    ro.observe(el);
    return () => ro.disconnect();
  }, [perMm]);
  const sheetMm = Math.max(figure.maxHeightMm, contentMm);
  const tooTall = contentMm > figure.maxHeightMm + 0.5;
  const clampZoom = (v: number) => Math.min(ZOOMS.max, Math.max(ZOOMS.min, v));
  const sharedYTitles = useSharedYTitles(figure);

  return (
    <section aria-label={`Figure ${figure.number} at print size`}>
      <div className="mb-2 flex flex-wrap items-center gap-3 text-sm print:hidden">
        <span className="text-muted tabular">
          {figure.widthMm} mm × up to {figure.maxHeightMm} mm · {figure.columns} column{figure.columns === 1 ? "" : "s"}
        </span>
        <div className="ml-auto flex items-center gap-2" role="group" aria-label="Zoom">
          <button
            type="button"
            className="h-7 w-7 rounded-sm border border-rule bg-sheet"
            aria-label="Zoom out"
            onClick={() => setZoomPct((z) => clampZoom(z - 25))}
          >
            −
          </button>
          <input
            type="range"
            aria-label="Zoom (%)"
            min={ZOOMS.min}
            max={ZOOMS.max}
            step={ZOOMS.step}
            value={zoomPct}
            onChange={(e) => setZoomPct(Number(e.target.value))}
            className="w-28 accent-accent"
          />
          <button
            type="button"
            className="h-7 w-7 rounded-sm border border-rule bg-sheet"
            aria-label="Zoom in"
            onClick={() => setZoomPct((z) => clampZoom(z + 25))}
          >
            +
          </button>
          <output className="w-12 text-right tabular" data-testid="zoom-level">
            {zoomPct} %
          </output>
          <button
            type="button"
            className="rounded-sm border border-rule bg-sheet px-2 py-0.5 text-xs"
            onClick={() => setZoomPct(100)}
            disabled={zoomPct === 100}
          >
            print size
          </button>
        </div>
      </div>
      <div className="overflow-auto rounded-sm border border-rule bg-[#e9e5dc] p-4 print:overflow-visible print:border-0 print:bg-transparent print:p-0">
        <div className="grid w-max print:block" style={{ gridTemplateColumns: "22px auto" }}>
          <div className="bg-sheet print:hidden" />
          <MmRuler lengthMm={figure.widthMm} zoom={zoom} orientation="horizontal" />
          <MmRuler lengthMm={sheetMm} zoom={zoom} orientation="vertical" />
          <div
            className="relative bg-white shadow-[0_1px_3px_rgba(0,0,0,0.15)] print:min-h-0! print:shadow-none"
            style={{ width: figure.widthMm * perMm, minHeight: sheetMm * perMm }}
            role="group"
            aria-label={`Figure ${figure.number}${figure.title ? `: ${figure.title}` : ""}, ${figure.panels.length} panel${figure.panels.length === 1 ? "" : "s"} on ${figure.columns} column${figure.columns === 1 ? "" : "s"}`}
            data-testid="figure-sheet"
          >
            <div
              ref={content}
              className="grid items-start"
              style={{ gridTemplateColumns: `repeat(${figure.columns}, minmax(0, 1fr))`, columnGap: GUTTER_MM * perMm, rowGap: GUTTER_MM * perMm }}
            >
              {figure.panels.map((p) => (
                <PanelTile key={p.id} panel={p} figure={figure} zoom={zoom} leaveOutYTitle={sharedYTitles.get(p.id)} />
              ))}
            </div>
            <div
              aria-hidden
              className="pointer-events-none absolute inset-x-0 border-t border-dashed border-bad/60 print:hidden"
              style={{ top: figure.maxHeightMm * perMm }}
            >
              <span className="absolute right-1 top-0.5 bg-white/80 px-1 text-[10px] text-bad">max height {figure.maxHeightMm} mm</span>
            </div>
          </div>
        </div>
      </div>
      {tooTall ? (
        <p role="status" className="mt-2 text-sm text-warn print:hidden">
          <span aria-hidden>△ </span>The panels are {Math.round(contentMm)} mm tall, more than the maximum height of {figure.maxHeightMm} mm.
        </p>
      ) : null}
      {figure.panels.length === 0 ? <p className="mt-2 text-sm text-muted">No panels yet — add one beside the figure.</p> : null}
    </section>
  );
}

function PanelTile({ panel, figure, zoom, leaveOutYTitle }: { panel: FigurePanel; figure: FigureView; zoom: number; leaveOutYTitle?: string }) {
  const rev = panel.currentRevision;
  const revision = useQuery({
    queryKey: queryKeys.revision(rev?.id ?? ""),
    queryFn: () => fetchJson<RevisionView>(`/api/revisions/${rev!.id}`),
    enabled: Boolean(rev),
    staleTime: Infinity,
  });
  const widthMm = panelWidthMm(figure, panel.colSpan);
  const style = figure.houseStyle;
  // One restyled spec per revision and style, so the chart is not redrawn on every render.
  const spec = useMemo(() => {
    if (!revision.data) return null;
    const styled = applyHouseStyle(revision.data.spec, style, { browser: true });
    return leaveOutYTitle === undefined ? styled : withoutYTitle(styled, leaveOutYTitle);
  }, [revision.data, style, leaveOutYTitle]);
  const letterPx = ((style.letterPt * 96) / 72) * zoom;
  // The link holds only the letter (its visible text is part of its name); its ::after covers the tile, so all of it stays clickable.
  return (
    <div
      className="group relative hover:bg-accent-soft/30"
      style={{ gridColumn: `span ${Math.min(figure.columns, panel.colSpan)}` }}
      data-testid={`panel-tile-${panel.letter}`}
    >
      <div className="flex items-center justify-between gap-2">
        <Link
          href={`/panels/${panel.id}`}
          className="after:absolute after:inset-0 after:z-10 after:content-[''] focus-visible:outline-none! focus-visible:after:outline-2 focus-visible:after:outline-solid focus-visible:after:outline-offset-2 focus-visible:after:outline-accent"
          aria-label={`Panel ${panel.letter}${panel.title ? `: ${panel.title}` : ""}`}
        >
          <span
            className="leading-none"
            style={{ fontSize: letterPx, fontWeight: style.letterWeight === "bold" ? 700 : 400, fontFamily: HOUSE_FONTS[style.font].browser }}
            data-testid="panel-letter"
          >
            {panelLetter(panel.letter, style)}
          </span>
        </Link>
        <span className="flex items-center gap-1.5 opacity-90 group-hover:opacity-100 print:hidden">
          <ReviewStateBadge state={panel.reviewState} />
          {panel.openThreads ? <OpenThreads count={panel.openThreads} /> : null}
        </span>
      </div>
      {rev && spec ? (
        <PanelChartLazy spec={spec} revisionId={rev.id} widthMm={widthMm} zoom={zoom} label={`Panel ${panel.letter}, revision ${rev.number}`} />
      ) : (
        <div className="flex items-center justify-center border border-dashed border-rule text-xs text-muted" style={{ height: 40 * PX_PER_MM * zoom }}>
          {rev ? "loading…" : "no revision yet — open the panel to build it"}
        </div>
      )}
    </div>
  );
}
