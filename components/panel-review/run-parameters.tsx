"use client";
import { useQueries } from "@tanstack/react-query";
import { fetchJson } from "@/components/api-client";
import { formatDate } from "@/lib/data/format";
import { formatWithUncertainty, parameterRows, storedParameters } from "@/lib/figures/fit-value";

interface StoredRunView {
  id: string;
  model: string;
  modelVersion: string;
  createdAt: string;
  result: unknown;
}

/**
 * The fitted parameters of every stored run the revision binds (curve, residuals or values), for reviewers:
 * name, value ± uncertainty rounded as the figure writes it, unit, and the model of the fit.
 */
export function RunParameters({ bound }: { bound: Record<string, { kind: string; id: string }> }) {
  const ids = [...new Set(Object.values(bound).flatMap((b) => (b.kind === "analysis" ? [b.id] : [])))].sort();
  const runs = useQueries({
    queries: ids.map((id) => ({ queryKey: ["analysis", id], queryFn: () => fetchJson<StoredRunView>(`/api/analyses/${id}`), staleTime: Infinity })),
  });
  if (!ids.length) return null;
  return (
    <section aria-label="Fitted parameters of the bound runs" className="mt-3 space-y-3 border-t border-rule pt-3">
      <h2 className="text-sm font-semibold">Fitted parameters of the bound runs</h2>
      {runs.map((q, i) =>
        q.data ? (
          <table key={ids[i]} className="w-full text-left text-xs" aria-label={`Parameters of the ${q.data.model} fit ${ids[i].slice(0, 6)}`}>
            <caption className="mb-1 text-left text-muted">
              {q.data.model} fit (model version {q.data.modelVersion}) · run {formatDate(q.data.createdAt)} · {ids[i].slice(0, 6)}
            </caption>
            <thead>
              <tr className="border-b border-rule">
                <th scope="col" className="py-1 pr-3 font-medium">
                  Parameter
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Value ± uncertainty
                </th>
                <th scope="col" className="py-1 pr-3 font-medium">
                  Unit
                </th>
                <th scope="col" className="py-1 font-medium">
                  Model
                </th>
              </tr>
            </thead>
            <tbody>
              {parameterRows(q.data.model, storedParameters(q.data.result)).map((p) => (
                <tr key={p.name} className="border-b border-rule/60">
                  <th scope="row" className="py-1 pr-3 font-mono font-normal">
                    {p.symbol}
                  </th>
                  <td className="py-1 pr-3 tabular-nums">{p.value === null ? "—" : formatWithUncertainty(p.value, p.error)}</td>
                  <td className="py-1 pr-3">{p.unit || "—"}</td>
                  <td className="py-1">{p.model}</td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : q.isError ? (
          <p key={ids[i]} role="alert" className="text-xs text-bad">
            ✕ {q.error.message}
          </p>
        ) : (
          <p key={ids[i]} className="text-xs text-muted">
            loading the run…
          </p>
        ),
      )}
    </section>
  );
}
