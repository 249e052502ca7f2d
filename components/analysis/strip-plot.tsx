import { useId } from "react";
import { extent, linearScale, padRange } from "@/components/data/plot-scales";
import { formatNumber } from "@/lib/data/format";
import type { PopulationStats } from "./api";

const W = 720,
  H = 300,
  LEFT = 70,
  RIGHT = 16,
  TOP = 14,
  BOTTOM = H - 56;
const POINT = "#0072B2";

/** A small fixed spread so equal values stay visible side by side; the same every render. */
const jitter = (i: number) => ((i * 0.618034) % 1) - 0.5;

/** The plot in words, for screen readers: each group's n, mean and sd, and how they are drawn. */
function stripPlotDescription(stats: Pick<PopulationStats, "groups" | "groupBy">, yTitle: string): string {
  const groups = stats.groups.map(
    (g) => `${g.group}: n = ${g.n}, mean ${formatNumber(g.mean, 4)}${g.sd !== null && Number.isFinite(g.sd) ? `, sd ${formatNumber(g.sd, 3)}` : ""}`,
  );
  return (
    `Strip plot of ${yTitle} per ${stats.groupBy}, ${stats.groups.length} group${stats.groups.length === 1 ? "" : "s"}: one dot per fitted value, ` +
    `a thick line at the group mean and a bar of ± one standard deviation. ${groups.join("; ")}.`
  );
}

/** Each group's values as dots, with the group mean ± sd as a bar and n under the name. */
export function StripPlot({ stats, yTitle }: { stats: PopulationStats; yTitle: string }) {
  const descriptionId = `strip-description-${useId().replace(/[^a-zA-Z0-9_-]/g, "")}`;
  const groups = stats.groups;
  const bars = groups.flatMap((g) => (g.sd === null || !Number.isFinite(g.sd) ? [g.mean] : [g.mean - g.sd, g.mean + g.sd]));
  const ys = linearScale(padRange(extent([stats.members.map((m) => m.value), bars]), 0.08), [BOTTOM, TOP], 5);
  const band = (W - LEFT - RIGHT) / Math.max(1, groups.length);
  const cx = (i: number) => LEFT + band * (i + 0.5);
  return (
    <svg
      viewBox={`0 0 ${W} ${H}`}
      className="h-auto w-full rounded-sm border border-rule bg-white"
      role="img"
      data-testid="strip-plot"
      aria-label={`Strip plot of ${yTitle} per ${stats.groupBy}`}
      aria-describedby={descriptionId}
    >
      <desc id={descriptionId}>{stripPlotDescription(stats, yTitle)}</desc>
      <rect x={LEFT} y={TOP} width={W - LEFT - RIGHT} height={BOTTOM - TOP} fill="none" stroke="#ddd8cc" />
      {ys.ticks.map((t) => (
        <g key={t.value}>
          <line x1={LEFT} x2={W - RIGHT} y1={ys(t.value)} y2={ys(t.value)} stroke="#eeeae1" />
          <text x={LEFT - 7} y={ys(t.value) + 3.5} textAnchor="end" className="fill-muted text-[11px]">
            {t.label}
          </text>
        </g>
      ))}
      <text transform={`translate(14 ${(TOP + BOTTOM) / 2}) rotate(-90)`} textAnchor="middle" className="fill-ink text-[12px]">
        {yTitle}
      </text>
      {groups.map((g, i) => {
        const values = stats.members.filter((m) => m.group === g.group);
        const half = Math.min(60, band * 0.3);
        const hasSd = g.sd !== null && Number.isFinite(g.sd);
        return (
          <g key={g.group}>
            {values.map((m, k) => (
              <circle
                key={m.analysisId}
                cx={cx(i) + jitter(k + 1) * half * 1.2}
                cy={ys(m.value)}
                r={4}
                fill={POINT}
                fillOpacity={0.75}
                stroke="#fff"
                strokeWidth={0.8}
              />
            ))}
            {hasSd ? (
              <g stroke="#1f2328" strokeWidth={1.5}>
                <line x1={cx(i) + half} x2={cx(i) + half} y1={ys(g.mean - g.sd)} y2={ys(g.mean + g.sd)} />
                <line x1={cx(i) + half - 5} x2={cx(i) + half + 5} y1={ys(g.mean - g.sd)} y2={ys(g.mean - g.sd)} />
                <line x1={cx(i) + half - 5} x2={cx(i) + half + 5} y1={ys(g.mean + g.sd)} y2={ys(g.mean + g.sd)} />
              </g>
            ) : null}
            <line x1={cx(i) - half} x2={cx(i) + half + 8} y1={ys(g.mean)} y2={ys(g.mean)} stroke="#1f2328" strokeWidth={2.5} />
            <text x={cx(i)} y={BOTTOM + 18} textAnchor="middle" className="fill-ink text-[12px]">
              {g.group}
            </text>
            <text x={cx(i)} y={BOTTOM + 34} textAnchor="middle" className="fill-muted text-[11px]">
              n = {g.n}
            </text>
          </g>
        );
      })}
      <text x={W - RIGHT} y={H - 6} textAnchor="end" className="fill-muted text-[10px]">
        dots: one fitted value each · thick line: mean · bar: ± sd
      </text>
    </svg>
  );
}
