"use client";
import { useId } from "react";
import { extent, linearScale, padRange } from "@/components/data/plot-scales";

const W = 360,
  H = 150,
  LEFT = 58,
  RIGHT = 10,
  TOP = 10,
  BOTTOM = H - 34;
const POINT = "#0072B2";

export interface ResidualSeries {
  label: string;
  residuals: Array<number | null>;
  preferred: boolean;
}

/**
 * One residual strip per candidate, side by side on one shared y scale, so a pattern left by a
 * wrong model and the spread of a right one can be told apart at a glance.
 */
export function ResidualStrips({ x, series, xTitle, yTitle }: { x: number[]; series: ResidualSeries[]; xTitle: string; yTitle: string }) {
  const xs = linearScale(padRange(extent([x]), 0.03), [LEFT, W - RIGHT], 4);
  const yRange = extent(series.map((s) => s.residuals));
  const half = yRange ? Math.max(Math.abs(yRange[0]), Math.abs(yRange[1])) : 1;
  const ys = linearScale(padRange([-half, half], 0.08), [BOTTOM, TOP], 4);
  return (
    <div className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4" data-testid="residual-strips">
      {series.map((s) => (
        <Strip key={s.label} series={s} x={x} xs={xs} ys={ys} xTitle={xTitle} yTitle={yTitle} />
      ))}
    </div>
  );
}

function Strip({
  series,
  x,
  xs,
  ys,
  xTitle,
  yTitle,
}: {
  series: ResidualSeries;
  x: number[];
  xs: ReturnType<typeof linearScale>;
  ys: ReturnType<typeof linearScale>;
  xTitle: string;
  yTitle: string;
}) {
  const descriptionId = `residual-strip-${useId().replace(/[^a-zA-Z0-9_-]/g, "")}`;
  const finite = series.residuals.filter((r): r is number => r !== null);
  const rms = finite.length ? Math.sqrt(finite.reduce((a, r) => a + r * r, 0) / finite.length) : NaN;
  return (
    <figure className="min-w-0">
      <figcaption className="mb-1 text-sm font-medium">
        {series.label}
        {series.preferred ? <span className="ml-2 text-xs font-semibold text-good">★ preferred</span> : null}
      </figcaption>
      <svg
        viewBox={`0 0 ${W} ${H}`}
        className="h-auto w-full rounded-sm border border-rule bg-white"
        role="img"
        aria-label={`Residuals of ${series.label}`}
        aria-describedby={descriptionId}
      >
        <desc id={descriptionId}>
          {`Residuals (data − fit) of ${series.label} against ${xTitle}, ${finite.length} points, root mean square ${Number.isFinite(rms) ? rms.toPrecision(3) : "undefined"}; the y scale is the same in every strip.`}
        </desc>
        <rect x={LEFT} y={TOP} width={W - LEFT - RIGHT} height={BOTTOM - TOP} fill="none" stroke="#ddd8cc" />
        {ys.ticks.map((t) => (
          <text key={t.value} x={LEFT - 6} y={ys(t.value) + 3.5} textAnchor="end" className="fill-muted text-[11px]">
            {t.label}
          </text>
        ))}
        {xs.ticks.map((t) => (
          <text key={t.value} x={xs(t.value)} y={BOTTOM + 14} textAnchor="middle" className="fill-muted text-[11px]">
            {t.label}
          </text>
        ))}
        <line x1={LEFT} x2={W - RIGHT} y1={ys(0)} y2={ys(0)} stroke="#8a8579" strokeDasharray="4 3" />
        {series.residuals.map((r, i) => (r === null ? null : <circle key={i} cx={xs(x[i])} cy={ys(r)} r={2} fill={POINT} />))}
        <text x={(LEFT + W - RIGHT) / 2} y={H - 4} textAnchor="middle" className="fill-ink text-[11px]">
          {xTitle}
        </text>
        <text transform={`translate(12 ${(TOP + BOTTOM) / 2}) rotate(-90)`} textAnchor="middle" className="fill-ink text-[11px]">
          {yTitle}
        </text>
      </svg>
    </figure>
  );
}
