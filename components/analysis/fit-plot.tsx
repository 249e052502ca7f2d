"use client";
import { useId, useState, type PointerEvent } from "react";
import { extent, linearScale, logScale, padRange, type Scale } from "@/components/data/plot-scales";
import { formatCount, formatValueError } from "@/lib/data/format";

const W = 720;
const LEFT = 70,
  RIGHT = 16,
  TOP = 12;
const MAIN_H = 250,
  GAP = 18,
  RES_H = 90;
const MAIN_BOTTOM = TOP + MAIN_H;
const RES_TOP = MAIN_BOTTOM + GAP,
  RES_BOTTOM = RES_TOP + RES_H;
const H = RES_BOTTOM + 48;
/** Okabe–Ito blue and vermillion: told apart with every common colour-vision deficiency, and by shape (dots vs line). */
const DATA = "#0072B2",
  CURVE = "#D55E00";

export interface FitPlotProps {
  /** `sigma`: one standard uncertainty per point, y units (the fit's σ column); drawn as ± σ error bars. */
  data: {
    x: number[];
    y: number[];
    sigma?: Array<number | null> | null;
    residuals: Array<number | null>;
    /** Points outside the fit window, drawn faded. */
    outside?: { x: number[]; y: number[] } | null;
  };
  /** The fit window [from, to] in x units, drawn shaded. */
  window?: readonly [number, number] | null;
  /** When given, a window can be drawn on the plot by dragging across it (the typed fields stay the keyboard way). */
  onWindow?: (range: [number, number]) => void;
  curve: { x: number[]; y: number[] };
  xTitle: string;
  yTitle: string;
  residualTitle: string;
  modelTitle: string;
  /** The σ column's name, for the legend. */
  sigmaName?: string;
  /** Fitted parameters, said in the plot's description ("T2 = 12.3 ± 0.4 µs"); a fixed one without error. */
  parameters?: Array<{ name: string; value: number | null; stderr?: number | null; unit?: string | null; fixed?: boolean }>;
}

/** The plot in words, for screen readers: what is drawn against what, how many points, the fitted values. */
function fitPlotDescription(p: FitPlotProps & { logX: boolean }): string {
  const points = (n: number) => `${formatCount(n)} point${n === 1 ? "" : "s"}`;
  const residuals = p.data.residuals.filter((r) => r !== null && r !== undefined).length;
  const sigma = p.data.sigma?.filter((v) => v !== null && Number.isFinite(v) && v > 0).length ?? 0;
  const parts = [
    `Scatter plot of ${p.yTitle} against ${p.xTitle}${p.logX ? " on a log scale" : ""}: ${points(p.data.x.length)}` +
      `${sigma ? ` with ± σ error bars${p.sigmaName ? ` from ${p.sigmaName}` : ""}` : ""}, and the fitted curve (${p.modelTitle}) as a line of ${points(p.curve.x.length)}.`,
    `Beneath, on the same x axis: ${p.residualTitle} (data − fit), ${points(residuals)}.`,
  ];
  const fitted = (p.parameters ?? []).map(
    (q) => `${q.name} = ${formatValueError(q.value, q.fixed ? null : q.stderr)}${q.unit ? ` ${q.unit}` : ""}${q.fixed ? " (held fixed)" : ""}`,
  );
  if (fitted.length) parts.push(`Fitted values: ${fitted.join("; ")}.`);
  if (p.window)
    parts.push(
      `Fitted only from ${p.window[0]} to ${p.window[1]} (shaded)${p.data.outside?.x.length ? `; ${points(p.data.outside.x.length)} outside it are drawn faded` : ""}.`,
    );
  return parts.join(" ");
}

/** ± σ as a vertical bar with caps, centred on (cx, cy) in pixels; `lo`/`hi` are the pixel ends. */
function ErrorBar({ cx, lo, hi }: { cx: number; lo: number; hi: number }) {
  return (
    <path d={`M${cx.toFixed(1)},${lo.toFixed(1)}V${hi.toFixed(1)}M${(cx - 2.5).toFixed(1)},${lo.toFixed(1)}h5M${(cx - 2.5).toFixed(1)},${hi.toFixed(1)}h5`} />
  );
}

/** Data points with the fitted curve, and the residuals (data − fit) in a strip beneath on the same x axis. */
export function FitPlot(props: FitPlotProps) {
  const { data, curve, xTitle, yTitle, residualTitle, modelTitle, sigmaName, window, onWindow } = props;
  const outside = data.outside ?? { x: [], y: [] };
  const [drag, setDrag] = useState<{ from: number; to: number } | null>(null);
  const clip = `fit-clip-${useId().replace(/[^a-zA-Z0-9_-]/g, "")}`;
  const positive = data.x.length > 0 && data.x.every((v) => v > 0) && outside.x.every((v) => v > 0);
  const xPositive = extent([data.x, outside.x], true);
  const [logX, setLogX] = useState(positive && xPositive !== null && xPositive[1] / xPositive[0] > 100);
  const useLog = logX && positive;
  const xs: Scale = useLog
    ? logScale(padRange(xPositive, 0.03, true), [LEFT, W - RIGHT])
    : linearScale(padRange(extent([data.x, outside.x]), 0.03), [LEFT, W - RIGHT], 7);
  const sigma = data.sigma?.some((v) => v !== null && v > 0) ? data.sigma : null;
  const sigmaAt = (i: number) => {
    const v = sigma?.[i];
    return v !== null && v !== undefined && Number.isFinite(v) && v > 0 ? v : null;
  };
  const yLo = sigma ? data.y.map((y, i) => y - (sigmaAt(i) ?? 0)) : [];
  const yHi = sigma ? data.y.map((y, i) => y + (sigmaAt(i) ?? 0)) : [];
  const ys = linearScale(padRange(extent([data.y, curve.y, yLo, yHi, outside.y]), 0.06), [MAIN_BOTTOM, TOP], 5);
  /** The x value under a pointer event, from the drawn scale. */
  const xAt = (e: PointerEvent<SVGSVGElement>): number => {
    const box = e.currentTarget.getBoundingClientRect();
    const px = Math.min(W - RIGHT, Math.max(LEFT, ((e.clientX - box.left) / box.width) * W));
    const f = (px - LEFT) / (W - RIGHT - LEFT);
    const [d0, d1] = xs.domain;
    return xs.log ? 10 ** (Math.log10(d0) + f * (Math.log10(d1) - Math.log10(d0))) : d0 + f * (d1 - d0);
  };
  const shaded = drag ? ([Math.min(drag.from, drag.to), Math.max(drag.from, drag.to)] as const) : window;
  const rMax = Math.max(1e-300, ...data.residuals.map((r, i) => (r === null ? 0 : Math.abs(r) + (sigmaAt(i) ?? 0)))) * 1.15;
  const rs = linearScale([-rMax, rMax], [RES_BOTTOM, RES_TOP], 4);
  const outer = Math.max(...rs.ticks.map((t) => Math.abs(t.value)));
  rs.ticks = rs.ticks.filter((t) => t.value === 0 || Math.abs(t.value) === outer);
  const path = curve.x.map((x, i) => (useLog && x <= 0 ? "" : `${i ? "L" : "M"}${xs(x).toFixed(1)},${ys(curve.y[i]).toFixed(1)}`)).join("");

  return (
    <figure className="m-0">
      <div className="mb-2 flex flex-wrap items-center justify-between gap-3 text-xs text-muted">
        <p className="flex flex-wrap items-center gap-4" aria-hidden>
          <span className="inline-flex items-center gap-1.5">
            <svg width="10" height="10">
              <circle cx="5" cy="5" r="3.5" fill={DATA} />
            </svg>
            data
          </span>
          <span className="inline-flex items-center gap-1.5">
            <svg width="22" height="10">
              <line x1="1" x2="21" y1="5" y2="5" stroke={CURVE} strokeWidth="2.5" />
            </svg>
            fit: {modelTitle}
          </span>
          {sigma ? (
            <span className="inline-flex items-center gap-1.5" data-testid="fit-plot-error-bars">
              <svg width="10" height="12">
                <path d="M5,1V11M2.5,1h5M2.5,11h5" stroke={DATA} strokeWidth="1.2" fill="none" />
              </svg>
              ± σ{sigmaName ? ` (${sigmaName})` : ""}
            </span>
          ) : null}
          <span>lower strip: residual = data − fit</span>
        </p>
        <label className="inline-flex items-center gap-1.5 text-ink">
          <input type="checkbox" checked={useLog} disabled={!positive} onChange={(e) => setLogX(e.target.checked)} />
          Logarithmic x axis
        </label>
      </div>
      <svg
        viewBox={`0 0 ${W} ${H}`}
        className="h-auto w-full rounded-sm border border-rule bg-white"
        role="img"
        aria-label={`Fit of ${modelTitle}: ${yTitle} against ${xTitle}, with residuals`}
        aria-describedby={`${clip}-description`}
        data-testid="fit-plot"
        style={onWindow ? { touchAction: "none", cursor: "col-resize" } : undefined}
        onPointerDown={
          onWindow
            ? (e) => {
                e.currentTarget.setPointerCapture(e.pointerId);
                const x = xAt(e);
                setDrag({ from: x, to: x });
              }
            : undefined
        }
        onPointerMove={onWindow && drag ? (e) => setDrag({ ...drag, to: xAt(e) }) : undefined}
        onPointerUp={
          onWindow && drag
            ? (e) => {
                const to = xAt(e);
                setDrag(null);
                const [lo, hi] = [Math.min(drag.from, to), Math.max(drag.from, to)];
                if (xs(hi) - xs(lo) > 4) onWindow([Number(lo.toPrecision(6)), Number(hi.toPrecision(6))]);
              }
            : undefined
        }
      >
        <defs>
          <clipPath id={`${clip}-main`}>
            <rect x={LEFT} y={TOP} width={W - LEFT - RIGHT} height={MAIN_H} />
          </clipPath>
        </defs>
        <Frame top={TOP} bottom={MAIN_BOTTOM} />
        <Frame top={RES_TOP} bottom={RES_BOTTOM} />
        {xs.ticks.map((t) => (
          <g key={t.value}>
            <line x1={xs(t.value)} x2={xs(t.value)} y1={TOP} y2={MAIN_BOTTOM} stroke="#eeeae1" />
            <line x1={xs(t.value)} x2={xs(t.value)} y1={RES_TOP} y2={RES_BOTTOM} stroke="#eeeae1" />
            <line x1={xs(t.value)} x2={xs(t.value)} y1={RES_BOTTOM} y2={RES_BOTTOM + 4} stroke="#5b6168" />
            <text x={xs(t.value)} y={RES_BOTTOM + 16} textAnchor="middle" className="fill-muted text-[11px]">
              {t.label}
            </text>
          </g>
        ))}
        <YTicks scale={ys} />
        <YTicks scale={rs} />
        <line x1={LEFT} x2={W - RIGHT} y1={rs(0)} y2={rs(0)} stroke="#5b6168" strokeDasharray="4 3" />
        <text x={(LEFT + W - RIGHT) / 2} y={H - 8} textAnchor="middle" className="fill-ink text-[12px]">
          {xTitle}
        </text>
        <text transform={`translate(14 ${(TOP + MAIN_BOTTOM) / 2}) rotate(-90)`} textAnchor="middle" className="fill-ink text-[12px]">
          {yTitle}
        </text>
        <text transform={`translate(14 ${(RES_TOP + RES_BOTTOM) / 2}) rotate(-90)`} textAnchor="middle" className="fill-ink text-[10px]">
          {residualTitle}
        </text>
        {shaded ? (
          <rect
            x={Math.max(LEFT, xs(shaded[0]))}
            y={TOP}
            width={Math.max(0, Math.min(W - RIGHT, xs(shaded[1])) - Math.max(LEFT, xs(shaded[0])))}
            height={RES_BOTTOM - TOP}
            fill="#0072B2"
            fillOpacity={0.07}
            data-testid="fit-plot-window"
          />
        ) : null}
        <g clipPath={`url(#${clip}-main)`}>
          <g data-testid="fit-plot-outside" aria-hidden>
            {outside.x.map((x, i) => (
              <circle key={i} cx={xs(x)} cy={ys(outside.y[i])} r={2.4} fill="#8a8f96" fillOpacity={0.35} />
            ))}
          </g>
          {sigma ? (
            <g stroke={DATA} strokeOpacity={0.55} strokeWidth={1} fill="none" aria-hidden>
              {data.x.map((x, i) => {
                const e = sigmaAt(i);
                return e === null ? null : <ErrorBar key={i} cx={xs(x)} lo={ys(data.y[i] - e)} hi={ys(data.y[i] + e)} />;
              })}
            </g>
          ) : null}
          {data.x.map((x, i) => (
            <circle key={i} cx={xs(x)} cy={ys(data.y[i])} r={2.6} fill={DATA} fillOpacity={0.85} />
          ))}
          <path d={path} fill="none" stroke={CURVE} strokeWidth={2} />
        </g>
        {sigma ? (
          <g stroke={DATA} strokeOpacity={0.55} strokeWidth={1} fill="none" aria-hidden>
            {data.x.map((x, i) => {
              const r = data.residuals[i];
              const e = sigmaAt(i);
              return r === null || r === undefined || e === null ? null : <ErrorBar key={i} cx={xs(x)} lo={rs(r - e)} hi={rs(r + e)} />;
            })}
          </g>
        ) : null}
        {data.x.map((x, i) => {
          const r = data.residuals[i];
          return r === null || r === undefined ? null : <circle key={i} cx={xs(x)} cy={rs(r)} r={2.2} fill={DATA} fillOpacity={0.85} />;
        })}
      </svg>
      <p id={`${clip}-description`} className="sr-only">
        {fitPlotDescription({ ...props, logX: useLog })}
      </p>
    </figure>
  );
}

function Frame({ top, bottom }: { top: number; bottom: number }) {
  return <rect x={LEFT} y={top} width={W - LEFT - RIGHT} height={bottom - top} fill="none" stroke="#ddd8cc" />;
}

function YTicks({ scale }: { scale: Scale }) {
  return (
    <>
      {scale.ticks.map((t) => (
        <g key={t.value}>
          <line x1={LEFT - 4} x2={LEFT} y1={scale(t.value)} y2={scale(t.value)} stroke="#5b6168" />
          <text x={LEFT - 7} y={scale(t.value) + 3.5} textAnchor="end" className="fill-muted text-[11px]">
            {t.label}
          </text>
        </g>
      ))}
    </>
  );
}
