import { formatNumber, formatP } from "@/lib/data/format";
import type { PopulationStats } from "./api";

const th = "px-3 py-2 whitespace-nowrap normal-case";
const td = "px-3 py-2 tabular-nums whitespace-nowrap";
const n = (v: number | null | undefined) => formatNumber(v, 4);

/** Per group: n, mean, sd, sem, median, IQR, range and the t-based 95 % CI of the mean. */
export function GroupsTable({ stats }: { stats: PopulationStats }) {
  return (
    <div className="relative overflow-x-auto">
      {stats.unit ? <p className="mb-1 text-xs text-muted">All values in {stats.unit} (n is a count).</p> : null}
      <table className="w-full border border-rule bg-sheet text-sm" aria-label={`Statistics of ${stats.parameter} per group`}>
        <thead className="bg-paper text-left text-xs tracking-wide text-muted">
          <tr>
            <th className={th}>{stats.groupBy}</th>
            <th className={th}>n</th>
            <th className={th}>mean</th>
            <th className={th}>sd</th>
            <th className={th}>sem</th>
            <th className={th}>median</th>
            <th className={th}>IQR</th>
            <th className={th}>min</th>
            <th className={th}>max</th>
            <th className={th}>95 % CI of the mean</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-rule">
          {stats.groups.map((g) => (
            <tr key={g.group}>
              <th scope="row" className="px-3 py-2 text-left font-medium">
                {g.group}
              </th>
              <td className={td}>{g.n}</td>
              <td className={td}>{n(g.mean)}</td>
              <td className={td}>{n(g.sd)}</td>
              <td className={td}>{n(g.sem)}</td>
              <td className={td}>{n(g.median)}</td>
              <td className={td}>
                {n(g.iqr)}{" "}
                <span className="text-xs text-muted">
                  ({n(g.q1)} – {n(g.q3)})
                </span>
              </td>
              <td className={td}>{n(g.min)}</td>
              <td className={td}>{n(g.max)}</td>
              <td className={td}>
                {n(g.ci95.low)} – {n(g.ci95.high)}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** Every pair of groups: location by Welch's t and Mann–Whitney U, spread by Brown–Forsythe. */
export function ComparisonsTable({ stats }: { stats: PopulationStats }) {
  if (!stats.comparisons.length) return <p className="text-sm text-muted">Comparisons need at least two groups.</p>;
  return (
    <div className="relative overflow-x-auto">
      <table className="w-full border border-rule bg-sheet text-sm" aria-label="Comparisons between groups">
        <thead className="bg-paper text-left text-xs tracking-wide text-muted">
          <tr>
            <th className={th}>Groups</th>
            <th className={th}>Welch t (df) · p</th>
            <th className={th}>Mann–Whitney U · p</th>
            <th className={th}>Brown–Forsythe F · p</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-rule">
          {stats.comparisons.map((c) => (
            <tr key={`${c.a}|${c.b}`}>
              <th scope="row" className="px-3 py-2 text-left font-medium">
                {c.a} <span className="font-normal text-muted">vs</span> {c.b}
              </th>
              <td className={td}>
                t = {formatNumber(c.welch.t, 3)} ({formatNumber(c.welch.df, 3)}) · p = {formatP(c.welch.p)}
              </td>
              <td className={td}>
                U = {formatNumber(c.mannWhitney.U, 4)} · p = {formatP(c.mannWhitney.p)}{" "}
                <span className="text-xs text-muted">({c.mannWhitney.method === "exact" ? "exact" : "normal approx."})</span>
              </td>
              <td className={td}>
                F = {formatNumber(c.brownForsythe.F, 3)} · p = {formatP(c.brownForsythe.p)}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
