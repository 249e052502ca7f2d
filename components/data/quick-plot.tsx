"use client";
import { useEffect, useId, useRef, useState } from "react";
import { axisTitle, formatCount, formatNumber } from "@/lib/data/format";
import type { PlotData } from "./api";
import { extent, isAscending, linearScale, logScale, padRange, type Scale } from "./plot-scales";

const M = { top: 14, right: 20, bottom: 56, left: 78 };
/** Okabe–Ito blue: distinct for the common colour-vision deficiencies and in greyscale print. */
const LINE = "#0072B2";

/** Polyline through ordered points, broken wherever a value is missing (or not drawable on log x). */
function linePath(xs: Array<number | null>, ys: Array<number | null>, sx: Scale, sy: Scale): string {
  let d = "";
  let pen = false;
  for (let i = 0; i < xs.length; i++) {
    const x = xs[i];
    const y = ys[i];
    if (x === null || y === null || !Number.isFinite(x) || !Number.isFinite(y) || (sx.log && x <= 0)) {
      pen = false;
      continue;
    }
    d += `${pen ? "L" : "M"}${sx(x).toFixed(1)},${sy(y).toFixed(1)}`;
    pen = true;
  }
  return d;
}

/** The plot in words, for screen readers: kind, axes, points drawn (of how many rows) and the ranges. */
function quickPlotDescription(data: PlotData, logX: boolean, ordered: boolean): string {
  const { x: xs, y: ys } = data.points;
  const drawn = xs.filter((x, i) => x !== null && ys[i] !== null && Number.isFinite(x) && Number.isFinite(ys[i]) && (!logX || x > 0)).length;
  const range = (v: Array<number | null>) => {
    const finite = v.filter((n): n is number => n !== null && Number.isFinite(n));
    if (!finite.length) return "with no values";
    const [lo, hi] = finite.reduce(([a, b], n) => [Math.min(a, n), Math.max(b, n)], [Infinity, -Infinity]);
    return `from ${formatNumber(lo)} to ${formatNumber(hi)}`;
  };
  const kind = ordered ? "Line chart" : "Scatter plot";
  const of = data.rowCount !== xs.length ? ` (${data.downsampled ? "reduced for display" : "shown"} from ${formatCount(data.rowCount)} rows)` : "";
  return (
    `${kind} of ${axisTitle(data.y.name, data.y.unit)} against ${axisTitle(data.x.name, data.x.unit)}${logX ? " on a log scale" : ""}: ` +
    `${formatCount(drawn)} point${drawn === 1 ? "" : "s"} drawn${of}. x ${range(xs)}; y ${range(ys)}.`
  );
}

/** Drawn at the width it is shown, so tick labels keep their size on a phone. */
function useWidth(initial: number) {
  const ref = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(initial);
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const observer = new ResizeObserver(([entry]) => {
      if (entry) setWidth(Math.round(entry.contentRect.width));
    });
    observer.observe(el);
    return () => observer.disconnect();
  }, []);
  return [ref, width] as const;
}

/** A quick look at two columns: a line when x is ordered, dots when it is not (maps, scatter). */
export function QuickPlot({ data, logX }: { data: PlotData; logX: boolean }) {
  const [box, measured] = useWidth(720);
  const clipId = `plot-${useId().replace(/[^a-zA-Z0-9_-]/g, "")}`;
  const W = Math.max(300, measured);
  const H = W < 520 ? 280 : 380;
  const X_PX: [number, number] = [M.left, W - M.right];
  const Y_PX: [number, number] = [H - M.bottom, M.top];
  const { x: xs, y: ys } = data.points;
  const xRange = extent([xs], logX);
  const yRange = extent([ys]);
  if (!xRange || !yRange)
    return (
      <div ref={box} className="text-sm text-muted">
        Nothing to draw: {logX ? "no positive x values" : "these columns have no finite values"}.
      </div>
    );
  const sx = logX ? logScale(padRange(xRange, 0, true), X_PX) : linearScale(padRange(xRange, 0), X_PX, W < 520 ? 4 : 8);
  const sy = linearScale(padRange(yRange, 0.05), Y_PX, W < 520 ? 5 : 7);
  const ordered = isAscending(xs);
  const inside = (v: number, s: Scale) => v >= Math.min(...s.domain) && v <= Math.max(...s.domain);
  const xTitle = axisTitle(data.x.name, data.x.unit);
  const yTitle = axisTitle(data.y.name, data.y.unit);

  return (
    <div ref={box}>
      <svg
        viewBox={`0 0 ${W} ${H}`}
        width={W}
        height={H}
        className="block h-auto max-w-full"
        role="img"
        aria-label={`${yTitle} against ${xTitle}${logX ? " (log x)" : ""}, ${xs.length} points`}
        aria-describedby={`${clipId}-description`}
        data-testid="quick-plot"
      >
        <desc id={`${clipId}-description`}>{quickPlotDescription(data, logX, ordered)}</desc>
        <rect x={M.left} y={M.top} width={W - M.left - M.right} height={H - M.top - M.bottom} fill="#fff" stroke="var(--color-rule)" />
        <g fontSize={12} fill="var(--color-muted)">
          {sy.ticks
            .filter((t) => inside(t.value, sy))
            .map((t) => (
              <g key={`y${t.value}`}>
                <line x1={M.left} x2={W - M.right} y1={sy(t.value)} y2={sy(t.value)} stroke="#eeeae1" />
                <line x1={M.left - 5} x2={M.left} y1={sy(t.value)} y2={sy(t.value)} stroke="var(--color-ink)" />
                <text x={M.left - 8} y={sy(t.value)} textAnchor="end" dominantBaseline="middle">
                  {t.label}
                </text>
              </g>
            ))}
          {sx.ticks
            .filter((t) => inside(t.value, sx))
            .map((t) => (
              <g key={`x${t.value}`}>
                <line y1={M.top} y2={H - M.bottom} x1={sx(t.value)} x2={sx(t.value)} stroke="#eeeae1" />
                <line y1={H - M.bottom} y2={H - M.bottom + 5} x1={sx(t.value)} x2={sx(t.value)} stroke="var(--color-ink)" />
                <text y={H - M.bottom + 18} x={sx(t.value)} textAnchor="middle">
                  {t.label}
                </text>
              </g>
            ))}
        </g>
        <line x1={M.left} x2={W - M.right} y1={H - M.bottom} y2={H - M.bottom} stroke="var(--color-ink)" />
        <line x1={M.left} x2={M.left} y1={M.top} y2={H - M.bottom} stroke="var(--color-ink)" />
        <g clipPath={`url(#${clipId})`}>
          <clipPath id={clipId}>
            <rect x={M.left} y={M.top} width={W - M.left - M.right} height={H - M.top - M.bottom} />
          </clipPath>
          {ordered ? (
            <path d={linePath(xs, ys, sx, sy)} fill="none" stroke={LINE} strokeWidth={1.25} strokeLinejoin="round" />
          ) : (
            xs.map((x, i) => {
              const y = ys[i];
              if (x === null || y === null || (logX && x <= 0)) return null;
              return <circle key={i} cx={sx(x)} cy={sy(y)} r={1.6} fill={LINE} fillOpacity={0.7} />;
            })
          )}
        </g>
        <text x={(X_PX[0] + X_PX[1]) / 2} y={H - 12} textAnchor="middle" fontSize={13} fill="var(--color-ink)">
          {xTitle}
        </text>
        <text transform={`translate(18 ${(Y_PX[0] + Y_PX[1]) / 2}) rotate(-90)`} textAnchor="middle" fontSize={13} fill="var(--color-ink)">
          {yTitle}
        </text>
      </svg>
    </div>
  );
}
