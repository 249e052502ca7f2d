"use client";
import { useState } from "react";
import { sendJson } from "@/components/api-client";
import { logScale, padRange } from "@/components/data/plot-scales";
import { Button, EmptyState, Field, Notice, TextInput } from "@/components/ui";
import { formatNumber, formatValueError } from "@/lib/data/format";
import type { ScalingCandidate } from "@/lib/server/analyses/scaling";

interface ScalingResult {
  parameter: string;
  unit: string | null;
  formula: string;
  weighting: string;
  points: Array<{ analysisId: string; dataset: string; pulses: number; value: number; stderr: number }>;
  fit: {
    t2One: { value: number; stderr: number; stderrScaled: number };
    exponent: { value: number; stderr: number; stderrScaled: number };
    chi2red: number;
    dof: number;
    converged: boolean;
    notes: string[];
  };
  curve: { pulses: number[]; value: number[] };
}

const W = 520,
  H = 300,
  LEFT = 64,
  RIGHT = 14,
  TOP = 12,
  BOTTOM = 250;
const DATA = "#0072B2",
  CURVE = "#D55E00";

/** T₂ against N on log–log axes: points with ± standard error bars and the fitted power law. */
function ScalingPlot({ result }: { result: ScalingResult }) {
  const ns = result.points.map((p) => p.pulses);
  const lows = result.points.map((p) => Math.max(p.value - p.stderr, p.value / 2));
  const highs = result.points.map((p) => p.value + p.stderr);
  const xs = logScale(padRange([Math.min(...ns), Math.max(...ns)], 0.08, true), [LEFT, W - RIGHT]);
  const ys = logScale(padRange([Math.min(...lows, ...result.curve.value), Math.max(...highs, ...result.curve.value)], 0.08, true), [BOTTOM, TOP]);
  const unit = result.unit ? ` (${result.unit})` : "";
  const path = result.curve.pulses.map((n, i) => `${i ? "L" : "M"}${xs(n).toFixed(1)},${ys(result.curve.value[i]).toFixed(1)}`).join("");
  return (
    <svg
      viewBox={`0 0 ${W} ${H}`}
      className="h-auto w-full max-w-xl rounded-sm border border-rule bg-white"
      role="img"
      aria-label={`${result.parameter} against the number of π pulses N on log–log axes: ${result.points.length} runs with ± standard error bars and the fitted line ${result.formula}`}
      data-testid="scaling-plot"
    >
      {xs.ticks.map((t) => (
        <g key={`x${t.value}`}>
          <line x1={xs(t.value)} x2={xs(t.value)} y1={BOTTOM} y2={BOTTOM + 4} stroke="#555" />
          <text x={xs(t.value)} y={BOTTOM + 16} fontSize="11" textAnchor="middle" fill="#333">
            {t.label}
          </text>
        </g>
      ))}
      {ys.ticks.map((t) => (
        <g key={`y${t.value}`}>
          <line x1={LEFT - 4} x2={LEFT} y1={ys(t.value)} y2={ys(t.value)} stroke="#555" />
          <text x={LEFT - 6} y={ys(t.value) + 4} fontSize="11" textAnchor="end" fill="#333">
            {t.label}
          </text>
        </g>
      ))}
      <line x1={LEFT} x2={W - RIGHT} y1={BOTTOM} y2={BOTTOM} stroke="#555" />
      <line x1={LEFT} x2={LEFT} y1={TOP} y2={BOTTOM} stroke="#555" />
      <text x={(LEFT + W - RIGHT) / 2} y={H - 14} fontSize="12" textAnchor="middle" fill="#222">
        number of π pulses N
      </text>
      <text transform={`translate(16 ${(TOP + BOTTOM) / 2}) rotate(-90)`} fontSize="12" textAnchor="middle" fill="#222">
        {result.parameter}
        {unit}
      </text>
      <path d={path} fill="none" stroke={CURVE} strokeWidth="2" />
      <g stroke={DATA} strokeWidth="1.2">
        {result.points.map((p, i) => {
          const cx = xs(p.pulses);
          const lo = ys(lows[i]);
          const hi = ys(highs[i]);
          return <path key={p.analysisId} d={`M${cx},${lo}V${hi}M${cx - 3},${lo}h6M${cx - 3},${hi}h6`} />;
        })}
      </g>
      {result.points.map((p) => (
        <circle key={p.analysisId} cx={xs(p.pulses)} cy={ys(p.value)} r="3.5" fill={DATA} />
      ))}
    </svg>
  );
}

/**
 * Decoupling scaling on the Analyses page: pick stored runs with a fitted T₂, give each its number of
 * π pulses N (from the dataset's `pulses` tag when it has one), and fit T₂(N) = T₂(1)·N^s.
 */
export function DecouplingScaling({ manuscriptId, candidates, mayRun }: { manuscriptId: string; candidates: ScalingCandidate[]; mayRun: boolean }) {
  const [chosen, setChosen] = useState<Record<string, boolean>>(() => Object.fromEntries(candidates.map((c) => [c.analysisId, c.pulses !== null])));
  const [pulses, setPulses] = useState<Record<string, string>>(() =>
    Object.fromEntries(candidates.map((c) => [c.analysisId, c.pulses === null ? "" : String(c.pulses)])),
  );
  const [result, setResult] = useState<ScalingResult | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  if (!candidates.length)
    return (
      <EmptyState title="No stored runs with a fitted T₂ yet">
        Fit echo decays (Hahn echo, CPMG, XY-8) and save the runs; each becomes one point here.
      </EmptyState>
    );

  async function fit() {
    setError(null);
    const runs = candidates
      .filter((c) => chosen[c.analysisId])
      .map((c) => ({ analysisId: c.analysisId, dataset: c.dataset, text: pulses[c.analysisId]?.trim() ?? "" }));
    const bad = runs.find((r) => !/^\d+$/.test(r.text) || Number(r.text) < 1);
    if (bad) {
      setError(`Number of π pulses for ${bad.dataset}: type a whole number, 1 or more.`);
      return;
    }
    setBusy(true);
    try {
      setResult(
        await sendJson<ScalingResult>("/api/analyses/scaling", "POST", {
          manuscriptId,
          runs: runs.map((r) => ({ analysisId: r.analysisId, pulses: Number(r.text) })),
        }),
      );
    } catch (err) {
      setResult(null);
      setError((err as Error).message);
    } finally {
      setBusy(false);
    }
  }

  const count = candidates.filter((c) => chosen[c.analysisId]).length;
  return (
    <div className="space-y-4">
      <p className="text-sm text-muted">
        Each chosen run gives one point, its T₂ ± standard error, weighted by that error. N is read from the dataset&apos;s “pulses” tag when it has one; type
        it otherwise (1 for a Hahn echo).
      </p>
      <div className="relative max-h-96 overflow-auto">
        <table className="w-full border border-rule bg-sheet text-sm" aria-label="Stored runs with a fitted T₂">
          <thead className="bg-paper text-left text-xs uppercase tracking-wide text-muted">
            <tr>
              <th className="px-3 py-2">Use</th>
              <th className="px-3 py-2">Dataset</th>
              <th className="px-3 py-2 normal-case">T₂ ± standard error</th>
              <th className="px-3 py-2">π pulses N</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-rule">
            {candidates.map((c) => (
              <tr key={c.analysisId} data-testid={`scaling-run-${c.analysisId}`}>
                <td className="px-3 py-2">
                  <input
                    type="checkbox"
                    aria-label={`Use ${c.dataset}`}
                    checked={chosen[c.analysisId] ?? false}
                    onChange={(e) => setChosen((all) => ({ ...all, [c.analysisId]: e.target.checked }))}
                  />
                </td>
                <td className="px-3 py-2">
                  {c.dataset}
                  <span className="block text-xs text-muted">
                    version {c.versionNumber} · {c.model}
                  </span>
                </td>
                <td className="px-3 py-2 tabular-nums">
                  {formatValueError(c.value, c.stderr)}
                  {c.unit ? ` ${c.unit}` : ""}
                </td>
                <td className="w-40 px-3 py-2">
                  <Field label={`π pulses for ${c.dataset}`}>
                    <TextInput
                      inputMode="numeric"
                      value={pulses[c.analysisId] ?? ""}
                      onChange={(e) => setPulses((all) => ({ ...all, [c.analysisId]: e.target.value }))}
                    />
                  </Field>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {mayRun ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button type="button" onClick={() => void fit()} disabled={busy || count < 3}>
            {busy ? "Fitting…" : "Fit T₂(N) = T₂(1)·N^s"}
          </Button>
          <span className="text-xs text-muted">{count < 3 ? "Choose at least 3 runs." : `${count} runs chosen; nothing is stored.`}</span>
        </div>
      ) : (
        <p className="text-sm text-muted">Only the PI and authors run analyses.</p>
      )}
      {error ? <Notice ok={false}>{error}</Notice> : null}
      {result ? (
        <div className="grid gap-4 lg:grid-cols-[minmax(0,1.2fr)_minmax(0,1fr)]" data-testid="scaling-result">
          <ScalingPlot result={result} />
          <div className="space-y-2 text-sm">
            <p className="font-mono">{result.formula}</p>
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 tabular-nums">
              <dt>T₂(1)</dt>
              <dd data-testid="scaling-t2-one">
                {formatValueError(result.fit.t2One.value, result.fit.t2One.stderr)}
                {result.unit ? ` ${result.unit}` : ""}
              </dd>
              <dt>s</dt>
              <dd data-testid="scaling-exponent">{formatValueError(result.fit.exponent.value, result.fit.exponent.stderr)}</dd>
              <dt>χ²ᵣ</dt>
              <dd>
                {formatNumber(result.fit.chi2red, 3)} ({result.fit.dof} degrees of freedom)
              </dd>
              <dt>Scaled by √χ²ᵣ</dt>
              <dd>
                T₂(1) ± {formatNumber(result.fit.t2One.stderrScaled, 2)}, s ± {formatNumber(result.fit.exponent.stderrScaled, 2)}
              </dd>
            </dl>
            <p className="text-xs text-muted">Errors: {result.weighting}.</p>
            <p>
              <a href={`data:text/csv;charset=utf-8,${encodeURIComponent(pointsCsv(result))}`} download="t2-versus-pulses.csv" className="underline">
                Download the points (CSV)
              </a>{" "}
              <span className="text-xs text-muted">— upload it as a dataset for the “T₂ versus pulse number” figure template.</span>
            </p>
            {result.fit.notes.map((n) => (
              <p key={n}>{n}</p>
            ))}
          </div>
        </div>
      ) : null}
    </div>
  );
}

/** The points as a CSV whose columns the “T₂ versus pulse number” template reads (N, T2, T2_err), the fit in comment lines. */
function pointsCsv(r: ScalingResult): string {
  const u = r.unit ? ` (${r.unit})` : "";
  const head = [
    `# ${r.formula}: ${r.parameter}(1) = ${r.fit.t2One.value} +- ${r.fit.t2One.stderr}${u}, s = ${r.fit.exponent.value} +- ${r.fit.exponent.stderr}`,
    `# errors: ${r.weighting}; chi2red = ${r.fit.chi2red} (${r.fit.dof} degrees of freedom)`,
    `N,T2${u},T2_err${u},dataset`,
  ];
  const rows = r.points.map((p) => `${p.pulses},${p.value},${p.stderr},"${p.dataset.replace(/"/g, '""')}"`);
  return [...head, ...rows].join("\n") + "\n";
}
