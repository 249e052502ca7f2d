"use client";
import { useQueries, useQuery, type UseQueryResult } from "@tanstack/react-query";
import { useMemo } from "react";
import { fetchJson } from "@/components/api-client";
import type { RowsPage } from "@/components/data/api";
import { parameterRows, storedParameters } from "@/lib/figures/fit-value";
import { queryKeys, type Binding, type BoundRows, type RevisionData, type Row } from "./api";

/** A binding plus the version whose rows it reads (an analysis output lives in its derived version). */
export type BindingChoice = ({ versionId: string } | { analysisId: string; output: "curve" | "residuals" | "data" | "parameters" }) & { rowsVersionId: string };

const SERIES: Record<string, string> = { curve: "curve", residuals: "residual", data: "data" };
const PREVIEW_LIMIT = 10_000;

const combineRuns = (results: UseQueryResult<{ model: string; result: unknown }>[]) => ({
  data: results.map((p) => p.data),
  error: results.find((p) => p.isError)?.error ?? null,
});

/** A stable `combine` for useQueries: the result keeps its identity until a page changes, so it can be a memo dependency. */
const combinePages = (results: UseQueryResult<RowsPage>[]) => ({
  data: results.map((p) => p.data),
  error: results.find((p) => p.isError)?.error ?? null,
});

export function toBinding(c: BindingChoice): Binding {
  return "analysisId" in c ? { analysisId: c.analysisId, output: c.output } : { versionId: c.versionId };
}

export function choicesFromRevision(
  rev: { bindings: Record<string, Binding>; bound: Record<string, { versionId: string }> } | null | undefined,
): Record<string, BindingChoice> {
  if (!rev) return {};
  return Object.fromEntries(
    Object.entries(rev.bindings).map(([n, b]) => [n, { ...b, rowsVersionId: rev.bound[n]?.versionId ?? ("versionId" in b ? b.versionId : "") }]),
  );
}

function sameBindings(a: Record<string, BindingChoice>, b: Record<string, Binding>): boolean {
  const ka = Object.keys(a).sort(),
    kb = Object.keys(b).sort();
  return ka.length === kb.length && ka.every((k, i) => k === kb[i] && JSON.stringify(toBinding(a[k])) === JSON.stringify(b[k]));
}

function toRecords(page: RowsPage, series: string | null): Row[] {
  const s = series ? page.names.indexOf("series") : -1;
  const out: Row[] = [];
  for (const r of page.rows) {
    if (s >= 0 && r[s] !== series) continue;
    const row: Row = {};
    page.names.forEach((n, i) => {
      row[n] = r[i] ?? null;
    });
    out.push(row);
  }
  return out;
}

/**
 * Rows for a preview. When the bindings are the saved revision's, its display data is used;
 * unsaved bindings read the bound versions' rows (first 10,000) in the browser.
 */
export function usePreviewData(choices: Record<string, BindingChoice>, revision: { id: string; bindings: Record<string, Binding> } | null) {
  const saved = Boolean(revision) && sameBindings(choices, revision!.bindings);
  const rev = useQuery({
    queryKey: queryKeys.revisionData(revision?.id ?? ""),
    queryFn: () => fetchJson<RevisionData>(`/api/revisions/${revision!.id}/data`),
    enabled: saved,
    staleTime: Infinity,
  });
  const ids = useMemo(
    () =>
      [
        ...new Set(
          Object.values(choices)
            .map((c) => c.rowsVersionId)
            .filter(Boolean),
        ),
      ].sort(),
    [choices],
  );
  const { data: pageData, error: failed } = useQueries({
    queries: ids.map((id) => ({
      queryKey: queryKeys.versionRows(id),
      queryFn: () => fetchJson<RowsPage>(`/api/versions/${id}/rows?limit=${PREVIEW_LIMIT}`),
      enabled: !saved,
      staleTime: Infinity,
    })),
    combine: combinePages,
  });
  // A run's fitted parameters (the "parameters" output) come from the run itself, not from a file's rows.
  const runIds = useMemo(
    () => [...new Set(Object.values(choices).flatMap((c) => ("analysisId" in c && c.output === "parameters" ? [c.analysisId] : [])))].sort(),
    [choices],
  );
  const { data: runData, error: runFailed } = useQueries({
    queries: runIds.map((id) => ({
      queryKey: ["analysis", id],
      queryFn: () => fetchJson<{ model: string; result: unknown }>(`/api/analyses/${id}`),
      enabled: !saved,
      staleTime: Infinity,
    })),
    combine: combineRuns,
  });
  const data = useMemo(() => {
    if (saved) return rev.data?.data;
    const out: Record<string, BoundRows> = {};
    for (const [name, c] of Object.entries(choices)) {
      if ("analysisId" in c && c.output === "parameters") {
        const run = runData[runIds.indexOf(c.analysisId)];
        if (!run) return undefined;
        const rows = parameterRows(run.model, storedParameters(run.result));
        out[name] = { rows, reduced: false, sourceRows: rows.length };
        continue;
      }
      const page = pageData[ids.indexOf(c.rowsVersionId)];
      if (!page) return undefined;
      const rows = toRecords(page, "analysisId" in c ? SERIES[c.output] : null);
      out[name] = { rows, reduced: page.rowCount > page.rows.length, sourceRows: page.rowCount };
    }
    return out;
  }, [saved, rev.data, choices, ids, pageData, runIds, runData]);
  return { data, error: saved ? rev.error : (failed ?? runFailed), saved };
}
