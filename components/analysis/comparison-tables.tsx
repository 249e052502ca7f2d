"use client";
import { formatNumber, formatP, formatValueError } from "@/lib/data/format";
import type { ComparisonResult } from "./api";
import { Converged } from "./fit-result";

const cell = "py-1.5 pr-3 tabular-nums";

type Candidate = ComparisonResult["candidates"][number];

/** "T2 = 60.1 ± 0.2 µs; n = 2 (held)": the candidate's parameters in one line. */
function parameterLine(c: Candidate): string {
  return c.parameters
    .map(
      (p) => `${p.name} = ${p.fixed ? `${formatNumber(p.value)} (held)` : formatValueError(p.value, p.stderr)}${p.unit && p.unit !== "1" ? ` ${p.unit}` : ""}`,
    )
    .join("; ");
}

/** The verdict, the ranking (χ²ᵣ, AIC, Akaike weight, BIC), the nested F-tests and each candidate's parameters. */
export function ComparisonTables({ result }: { result: ComparisonResult }) {
  return (
    <>
      <div className={`rounded-sm border px-3 py-2 text-sm ${result.preferred ? "border-good bg-paper" : "border-bad"}`} data-testid="comparison-verdict">
        <p className="font-semibold">
          {result.preferred ? (
            <>
              <span aria-hidden>★ </span>Preferred: {result.preferred}
            </>
          ) : (
            "No candidate can be preferred"
          )}
        </p>
        <p className="mt-0.5">{result.reason}</p>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full text-sm" aria-label="Candidates ranked">
          <thead>
            <tr className="border-b border-rule text-left text-xs text-muted">
              <th className="py-1.5 pr-3">Candidate</th>
              <th className="py-1.5 pr-3">Free parameters</th>
              <th className="py-1.5 pr-3">χ²ᵣ</th>
              <th className="py-1.5 pr-3">AIC</th>
              <th className="py-1.5 pr-3">ΔAIC</th>
              <th className="py-1.5 pr-3">Akaike weight</th>
              <th className="py-1.5 pr-3">BIC</th>
              <th className="py-1.5 pr-3">ΔBIC</th>
              <th className="py-1.5">Fit</th>
            </tr>
          </thead>
          <tbody>
            {result.candidates.map((c) => {
              const preferred = c.label === result.preferred;
              return (
                <tr key={c.label} className={`border-b border-rule align-top ${preferred ? "bg-accent-soft" : ""}`}>
                  <th scope="row" className="py-1.5 pr-3 text-left font-medium">
                    {c.label}
                    {preferred ? <span className="ml-2 text-xs font-semibold text-good">★ preferred</span> : null}
                    <span className="block text-xs font-normal text-muted">{parameterLine(c)}</span>
                  </th>
                  <td className={cell}>{c.k}</td>
                  <td className={cell}>{formatNumber(c.chi2red, 3)}</td>
                  <td className={cell}>{formatNumber(c.aic, 5)}</td>
                  <td className={cell}>{formatNumber(c.deltaAic, 3)}</td>
                  <td className={cell}>{formatNumber(c.akaikeWeight, 2)}</td>
                  <td className={cell}>{formatNumber(c.bic, 5)}</td>
                  <td className={cell}>{formatNumber(c.deltaBic, 3)}</td>
                  <td className="py-1.5 text-xs">
                    <Converged ok={c.converged} quality={c.quality} />
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {result.tests.length ? (
        <div className="overflow-x-auto">
          <table className="w-full text-sm" aria-label="F-tests of nested candidates">
            <caption className="mb-1 text-left text-sm font-semibold">F-tests where one candidate is another with parameters held</caption>
            <thead>
              <tr className="border-b border-rule text-left text-xs text-muted">
                <th className="py-1.5 pr-3">Simpler</th>
                <th className="py-1.5 pr-3">Fuller</th>
                <th className="py-1.5 pr-3">F</th>
                <th className="py-1.5 pr-3">Degrees of freedom</th>
                <th className="py-1.5 pr-3">p</th>
                <th className="py-1.5">Outcome at the 5 % level</th>
              </tr>
            </thead>
            <tbody>
              {result.tests.map((t) => (
                <tr key={`${t.simpler}|${t.fuller}`} className="border-b border-rule">
                  <td className="py-1.5 pr-3">{t.simpler}</td>
                  <td className="py-1.5 pr-3">{t.fuller}</td>
                  <td className={cell}>{formatNumber(t.f, 4)}</td>
                  <td className={cell}>
                    {t.df1}, {t.df2}
                  </td>
                  <td className={cell}>{formatP(t.p)}</td>
                  <td className="py-1.5 text-xs">{t.rejectsSimpler ? "the extra parameters are needed" : "the simpler candidate is enough"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : (
        <p className="text-xs text-muted">No candidate is another with parameters held, so no F-test applies; AIC and BIC still compare them.</p>
      )}
      <p className="text-xs text-muted">
        {result.points} points, {result.weighted ? `weighted by σ from ${result.options.sigma}` : "unweighted"}. AIC = m·ln(χ²/m) + 2k and BIC = m·ln(χ²/m) +
        k·ln m (m points, k free parameters); Akaike weights are exp(−ΔAIC/2) normalised over the candidates. A ΔAIC below 2 is no real support for extra
        parameters (Burnham &amp; Anderson 2002, §2.6); the F-test is the extra-sum-of-squares test for nested least-squares fits. A candidate whose fit the
        data do not support is not preferred.
      </p>
    </>
  );
}
