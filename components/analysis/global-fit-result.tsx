"use client";
import { axisTitle, formatNumber, formatValueError } from "@/lib/data/format";
import type { GlobalFitResult, ModelInfo } from "./api";
import { FitPlot } from "./fit-plot";

/** The shared values once, the local ones per dataset, the joint goodness of fit, and one plot per dataset. */
export function GlobalFitResultView({ result, model, xName, yName }: { result: GlobalFitResult; model: ModelInfo; xName: string; yName: string }) {
  const shared = result.params.filter((p) => p.dataset === null);
  const localNames = [...new Set(result.params.filter((p) => p.dataset !== null).map((p) => p.name))];
  const local = (k: number, name: string) => result.params.find((p) => p.dataset === k && p.name === name);
  const unitOf = (name: string) => result.params.find((p) => p.name === name)?.unit ?? "";
  const fixedNames = Object.keys(result.fixed);
  return (
    <div className="space-y-5" data-testid="global-fit-result">
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.4fr)]">
        <div className="space-y-4">
          {shared.length ? (
            <table className="w-full text-sm" aria-label="Shared parameters">
              <caption className="pb-1 text-left text-xs uppercase tracking-wide text-muted">Shared by all {result.datasets.length} datasets</caption>
              <tbody className="divide-y divide-rule/70">
                {shared.map((p) => (
                  <tr key={p.name} data-testid={`shared-${p.name}`}>
                    <th scope="row" className="py-1.5 pr-3 text-left font-mono font-medium">
                      {p.name}
                    </th>
                    <td className="py-1.5 pr-3 tabular-nums">{formatValueError(p.value, p.stderr)}</td>
                    <td className="py-1.5 pr-3">{p.unit || <span className="text-muted">1</span>}</td>
                    <td className="py-1.5 text-xs text-warn">{p.atBound ? "⚠ at a bound" : p.stderr === null ? "⚠ not determined" : ""}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : (
            <p className="text-sm text-muted">Nothing shared: the same as fitting each dataset alone, with one covariance.</p>
          )}
          {fixedNames.length ? (
            <p className="text-sm">Held fixed: {fixedNames.map((n) => `${n} = ${result.fixed[n]}${unitOf(n) ? ` ${unitOf(n)}` : ""}`).join(", ")}</p>
          ) : null}
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm" aria-label="Goodness of the global fit">
            <dt className="text-muted">χ²ᵣ</dt>
            <dd className="tabular-nums" data-testid="global-chi2red">
              {formatNumber(result.chi2red, 3)}
            </dd>
            <dt className="text-muted">Points · dof</dt>
            <dd className="tabular-nums">
              {result.datasets.reduce((a, d) => a + d.points, 0)} · {result.dof}
            </dd>
            <dt className="text-muted">AIC · BIC</dt>
            <dd className="tabular-nums">
              {formatNumber(result.aic, 4)} · {formatNumber(result.bic, 4)}
            </dd>
            <dt className="text-muted">Solver</dt>
            <dd className={result.converged ? "" : "text-bad"}>
              <span aria-hidden className="font-bold">
                {result.converged ? "✓ " : "✕ "}
              </span>
              {result.converged ? "converged" : "did not converge"} <span className="text-muted">({result.reason})</span>
            </dd>
          </dl>
        </div>
        <div className="relative overflow-x-auto">
          <table className="w-full text-sm" aria-label="Parameters per dataset">
            <caption className="pb-1 text-left text-xs uppercase tracking-wide text-muted">Fitted per dataset</caption>
            <thead className="text-left text-xs uppercase tracking-wide text-muted">
              <tr className="border-b border-rule">
                <th className="py-1.5 pr-3">Dataset</th>
                {localNames.map((n) => (
                  <th key={n} className="py-1.5 pr-3">
                    <span className="font-mono normal-case">{n}</span>
                    {unitOf(n) ? ` (${unitOf(n)})` : ""}
                  </th>
                ))}
                <th className="py-1.5">χ² per point</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-rule/70">
              {result.datasets.map((d, k) => (
                <tr key={d.versionId}>
                  <th scope="row" className="py-1.5 pr-3 text-left font-medium">
                    {d.label}
                  </th>
                  {localNames.map((n) => {
                    const p = local(k, n);
                    return (
                      <td key={n} className="py-1.5 pr-3 tabular-nums">
                        {p ? formatValueError(p.value, p.stderr) : "—"}
                        {p?.atBound ? <span className="text-warn"> ⚠ at a bound</span> : null}
                      </td>
                    );
                  })}
                  <td className="py-1.5 tabular-nums">{formatNumber(d.chi2PerPoint, 3)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </div>
      {result.warnings.length ? (
        <ul aria-label="Global fit warnings" className="space-y-1 text-sm text-warn">
          {result.warnings.map((w) => (
            <li key={w} className="flex items-start gap-2">
              <span aria-hidden className="font-bold">
                ⚠
              </span>
              <span>{w}</span>
            </li>
          ))}
        </ul>
      ) : null}
      <div className="grid gap-4 xl:grid-cols-2">
        {result.datasets.map((d) => (
          <figure key={d.versionId} className="min-w-0">
            <figcaption className="mb-1 text-sm font-medium">{d.label}</figcaption>
            <FitPlot
              data={d.data}
              curve={d.curve}
              modelTitle={`${model.title}, global`}
              xTitle={axisTitle(xName, result.units.x)}
              yTitle={axisTitle(yName, result.units.y)}
              residualTitle={axisTitle("residual", result.units.y)}
              sigmaName={result.options.sigma}
              parameters={model.parameters.map((p) => ({ name: p.name, value: d.values[p.name], stderr: d.stderr[p.name], unit: unitOf(p.name) }))}
            />
          </figure>
        ))}
      </div>
      <p className="text-xs text-muted">
        One weighted least-squares fit of every point of the {result.datasets.length} datasets (
        {result.options.sigma ? `σ from ${result.options.sigma}` : "unweighted"}); shared parameters take one value for all; standard errors come from the joint
        covariance scaled by √χ²ᵣ. Model {result.model} version {result.modelVersion}. Not stored.
      </p>
    </div>
  );
}
