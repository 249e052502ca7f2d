"use client";
import { axisTitle, formatNumber, formatValueError } from "@/lib/data/format";
import type { FitResult } from "./api";
import { BootstrapTable } from "./bootstrap-table";
import { FitPlot } from "./fit-plot";

/** Status as a shape and words: never colour alone. */
function Warnings({ items, label = "Fit warnings" }: { items: string[]; label?: string }) {
  if (!items.length) return null;
  return (
    <ul aria-label={label} className="space-y-1 text-sm text-warn">
      {items.map((w) => (
        <li key={w} className="flex items-start gap-2">
          <span aria-hidden className="font-bold">
            ⚠
          </span>
          <span>{w}</span>
        </li>
      ))}
    </ul>
  );
}

type QualityLevel = "good" | "questionable" | "not supported";

/** The fit's overall level in a colour, a shape and words (lib/analysis/fit-quality). */
const QUALITY: Record<QualityLevel, { tone: string; mark: string; words: string }> = {
  good: { tone: "text-good", mark: "✓", words: "good fit" },
  questionable: { tone: "text-warn", mark: "⚠", words: "questionable fit" },
  "not supported": { tone: "text-bad", mark: "✕", words: "fit not supported by the data" },
};

/**
 * The solver's outcome and, beside it, whether the fit describes the data: the tick is green only
 * when the fit was judged good; a run stored before fits were judged says so.
 */
export function Converged({ ok, reason, quality }: { ok: boolean | undefined; reason?: string; quality?: { level: QualityLevel; summary?: string } | null }) {
  if (!ok) {
    return (
      <span className="text-bad">
        <span aria-hidden className="font-bold">
          ✕{" "}
        </span>
        did not converge{reason ? <span className="text-muted"> ({reason})</span> : null}
      </span>
    );
  }
  const q = quality ? QUALITY[quality.level] : undefined;
  return (
    <span className={q?.tone ?? "text-muted"} title={quality?.summary}>
      <span aria-hidden className="font-bold">
        ✓{" "}
      </span>
      converged{reason ? <span className="text-muted"> ({reason})</span> : null}
      <span data-testid="fit-quality-level">
        {" · "}
        {q ? (
          <>
            <span aria-hidden className="font-bold">
              {q.mark}{" "}
            </span>
            {q.words}
          </>
        ) : (
          "quality not judged"
        )}
      </span>
    </span>
  );
}

/** Why the fit got its level: one line per finding, the serious ones first. */
function QualityFindings({ quality }: { quality: NonNullable<FitResult["quality"]> }) {
  if (!quality.findings.length) return null;
  const ordered = [...quality.findings].sort((a, b) => (a.level === b.level ? 0 : a.level === "not supported" ? -1 : 1));
  return (
    <div className="space-y-1 text-sm" data-testid="fit-quality">
      <p className={`font-medium ${QUALITY[quality.level].tone}`}>
        <span aria-hidden className="font-bold">
          {QUALITY[quality.level].mark}{" "}
        </span>
        {quality.summary.charAt(0).toUpperCase() + quality.summary.slice(1)}.
      </p>
      <ul aria-label="Fit quality findings" className="space-y-1">
        {ordered.map((f) => (
          <li key={f.message} className={`flex items-start gap-2 ${QUALITY[f.level].tone}`}>
            <span aria-hidden className="font-bold">
              {QUALITY[f.level].mark}
            </span>
            <span>{f.message}</span>
          </li>
        ))}
      </ul>
    </div>
  );
}

/** The fitted curve over the data with residuals, the parameters with standard errors, and how well it fits. */
export function FitResultView({
  result,
  modelTitle,
  xName,
  yName,
  onWindow,
}: {
  result: FitResult;
  modelTitle: string;
  xName: string;
  yName: string;
  /** Drawing a fit window on the plot sets it in the form. */
  onWindow?: (range: [number, number]) => void;
}) {
  const yTitle = axisTitle(yName, result.units.y);
  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,1.45fr)_minmax(0,1fr)]">
      <FitPlot
        data={result.data}
        curve={result.curve}
        modelTitle={modelTitle}
        xTitle={axisTitle(xName, result.units.x)}
        yTitle={yTitle}
        residualTitle={axisTitle("residual", result.units.y)}
        sigmaName={result.options.sigma}
        parameters={result.parameters}
        window={result.options.xRange ? [result.options.xRange[0], result.options.xRange[1]] : null}
        onWindow={onWindow}
      />
      <div className="space-y-4">
        <div className="relative overflow-x-auto">
          <table className="w-full text-sm" aria-label="Fitted parameters">
            <thead className="text-left text-xs uppercase tracking-wide text-muted">
              <tr className="border-b border-rule">
                <th className="py-1.5 pr-3">Parameter</th>
                <th className="py-1.5 pr-3">Value ± standard error</th>
                <th className="py-1.5 pr-3">Unit</th>
                <th className="py-1.5">Note</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-rule/70">
              {result.parameters.map((p) => (
                <tr key={p.name} data-testid={`param-${p.name}`}>
                  <th scope="row" className="py-1.5 pr-3 text-left font-mono font-medium">
                    {p.name}
                  </th>
                  <td className="py-1.5 pr-3 tabular-nums">{formatValueError(p.value, p.fixed ? null : p.stderr)}</td>
                  <td className="py-1.5 pr-3">{p.unit || <span className="text-muted">1</span>}</td>
                  <td className="py-1.5 text-xs">
                    {p.fixed ? (
                      <span className="text-muted">
                        <span aria-hidden>◇ </span>held fixed
                      </span>
                    ) : null}
                    {p.atBound ? (
                      <span className="text-warn">
                        <span aria-hidden className="font-bold">
                          ⚠{" "}
                        </span>
                        at a bound
                      </span>
                    ) : null}
                    {!p.fixed && p.stderr === null ? (
                      <span className="text-warn">
                        <span aria-hidden className="font-bold">
                          ⚠{" "}
                        </span>
                        not determined
                      </span>
                    ) : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        {result.derived?.length ? <DerivedTable items={result.derived} /> : null}
        {result.quality ? <QualityFindings quality={result.quality} /> : null}
        {result.verdicts?.map((v) => (
          <p key={v} className={`text-sm font-medium ${v.startsWith("Single emitter") ? "text-good" : "text-warn"}`} data-testid="fit-verdict">
            {v}
          </p>
        ))}
        <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm" aria-label="Goodness of fit">
          <dt className="text-muted">χ²ᵣ</dt>
          <dd className="tabular-nums" data-testid="chi2red">
            {formatNumber(result.chi2red, 3)}
          </dd>
          <dt className="text-muted">R²</dt>
          <dd className="tabular-nums">{formatNumber(result.r2, 5)}</dd>
          {result.quality?.chi2Interval ? (
            <>
              <dt className="text-muted">χ²ᵣ expected (99 %)</dt>
              <dd className="tabular-nums" data-testid="chi2-interval">
                {formatNumber(result.quality.chi2Interval[0], 3)}–{formatNumber(result.quality.chi2Interval[1], 3)}
              </dd>
            </>
          ) : null}
          <dt className="text-muted">Runs test</dt>
          <dd className="tabular-nums" data-testid="runs-test">
            {result.quality?.runs ? `z = ${formatNumber(result.quality.runs.z, 3)}, p = ${formatNumber(result.quality.runs.p, 2)}` : "too few points"}
          </dd>
          <dt className="text-muted">Durbin–Watson d</dt>
          <dd className="tabular-nums" data-testid="durbin-watson">
            {result.quality?.durbinWatson ? formatNumber(result.quality.durbinWatson.d, 3) : "too few points"}
          </dd>
          <dt className="text-muted">Points · dof</dt>
          <dd className="tabular-nums">
            {result.points} · {result.dof}
          </dd>
          <dt className="text-muted">Iterations</dt>
          <dd className="tabular-nums">{result.iterations}</dd>
          <dt className="text-muted">Solver</dt>
          <dd>
            <Converged ok={result.converged} reason={result.reason} quality={result.quality} />
          </dd>
        </dl>
        <p className="text-xs text-muted">
          {result.options.sigma ? `Weighted by the ${result.options.sigma} column; ` : "Unweighted (no σ column); "}
          standard errors are scaled by √χ²ᵣ
          {result.bootstrap
            ? `; intervals are percentiles of ${result.bootstrap.used} refits to the fitted curve plus resampled residuals (residual bootstrap, ${result.bootstrap.draws} draws, seed ${result.bootstrap.seed})`
            : ""}
          . Model version {result.modelVersion}.
        </p>
        <Warnings items={[...result.warnings, ...(result.bootstrap?.warnings ?? [])]} />
      </div>
      {result.bootstrap ? (
        <div className="lg:col-span-2">
          <BootstrapTable bootstrap={result.bootstrap} />
        </div>
      ) : null}
    </div>
  );
}

/** Quantities computed from the parameters, each with its formula and propagated error. */
function DerivedTable({ items }: { items: NonNullable<FitResult["derived"]> }) {
  return (
    <table className="w-full text-sm" aria-label="Derived quantities">
      <caption className="pb-1 text-left text-xs uppercase tracking-wide text-muted">Derived (errors through the covariance)</caption>
      <tbody className="divide-y divide-rule/70">
        {items.map((d) => (
          <tr key={d.name} data-testid={`derived-${d.name}`}>
            <th scope="row" className="py-1.5 pr-3 text-left font-medium">
              {d.description} <span className="font-mono text-xs text-muted">{d.formula}</span>
            </th>
            <td className="py-1.5 pr-3 tabular-nums">{formatValueError(d.value, d.stderr)}</td>
            <td className="py-1.5">{d.unit || <span className="text-muted">1</span>}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
