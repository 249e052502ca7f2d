import Link from "next/link";
import { formatNumber, formatValueError } from "@/lib/data/format";
import type { ModelInfo, SavedRun } from "./api";
import type { BatchDataset } from "./batch-types";
import { Converged } from "./fit-result";

export interface BatchOutcome {
  dataset: BatchDataset;
  /** The stored run as the batch reports it (without the points and curve). */
  run?: Omit<SavedRun, "data" | "curve">;
  error?: string;
}

/** One row per dataset: each parameter value ± standard error, χ²ᵣ and whether the solver converged. */
export function BatchResults({ outcomes, model, groupTag }: { outcomes: BatchOutcome[]; model: ModelInfo; groupTag: string }) {
  const unitOf = (name: string) => outcomes.find((o) => o.run)?.run?.parameters.find((p) => p.name === name)?.unit ?? "";
  const th = "px-2.5 py-2 whitespace-nowrap";
  return (
    <div className="relative overflow-x-auto">
      <table className="w-full border border-rule bg-sheet text-sm" aria-label="Batch fit results">
        <thead className="bg-paper text-left text-xs uppercase tracking-wide text-muted">
          <tr>
            <th className={th}>Dataset</th>
            <th className={th}>{groupTag}</th>
            {model.parameters.map((p) => (
              <th key={p.name} className={`${th} normal-case`}>
                <span className="font-mono">{p.name}</span>
                {unitOf(p.name) ? ` (${unitOf(p.name)})` : ""}
              </th>
            ))}
            <th className={`${th} normal-case`}>χ²ᵣ</th>
            <th className={th}>Solver</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-rule">
          {outcomes.map(({ dataset, run, error }) => (
            <tr key={dataset.id}>
              <td className="whitespace-nowrap px-2.5 py-2">
                <Link href={`/versions/${dataset.versionId}/fit`} className="underline">
                  {dataset.name}
                </Link>
              </td>
              <td className="whitespace-nowrap px-2.5 py-2">{dataset.tags[groupTag] ?? "—"}</td>
              {run ? (
                <>
                  {model.parameters.map((p) => {
                    const q = run.parameters.find((r) => r.name === p.name);
                    return (
                      <td key={p.name} className="whitespace-nowrap px-2.5 py-2 tabular-nums">
                        {q ? formatValueError(q.value, q.fixed ? null : q.stderr) : "—"}
                        {q?.atBound ? (
                          <span className="text-warn" title="at a bound">
                            {" "}
                            ⚠<span className="sr-only"> at a bound</span>
                          </span>
                        ) : null}
                      </td>
                    );
                  })}
                  <td className="px-2.5 py-2 tabular-nums">{formatNumber(run.chi2red, 3)}</td>
                  <td className="whitespace-nowrap px-2.5 py-2">
                    <Converged ok={run.converged} quality={run.quality} />
                  </td>
                </>
              ) : (
                <td colSpan={model.parameters.length + 2} className="px-2.5 py-2 text-bad">
                  <span aria-hidden className="font-bold">
                    ✕{" "}
                  </span>
                  {error}
                </td>
              )}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
