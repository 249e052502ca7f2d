"use client";
import { useQueries, useQuery } from "@tanstack/react-query";
import { fetchJson } from "@/components/api-client";
import type { VersionView } from "@/components/data/api";
import { queryKeys, type AnalysisItem, type DatasetItem } from "@/components/figures/api";
import { formatDate } from "@/lib/data/format";
import type { FitFacts } from "@/lib/figures/plots/data-defaults";
import type { ColumnInfo } from "./option-input";

/** What a data name can be bound to: a version of a dataset (its kind of measurement known), or an output of a stored analysis (with its fit). */
export type Source =
  | { kind: "version"; versionId: string; label: string; columns: ColumnInfo[]; measurement: string }
  | { kind: "analysis"; analysisId: string; derivedVersionId: string; label: string; versionId: string; createdAt: string; fit: FitFacts };

/** The model and fitted parameters of a stored run, read from its result. */
function fitOf(a: AnalysisItem): FitFacts {
  const params = (a.result as { parameters?: unknown }).parameters;
  const parameters = Array.isArray(params)
    ? params.flatMap((p: unknown) => {
        const q = p as { name?: unknown; value?: unknown; unit?: unknown };
        return typeof q.name === "string"
          ? [{ name: q.name, value: typeof q.value === "number" ? q.value : null, unit: typeof q.unit === "string" ? q.unit : null }]
          : [];
      })
    : [];
  return { model: a.model, parameters };
}

export const sourceKey = (s: Source) => (s.kind === "version" ? `v:${s.versionId}` : `a:${s.analysisId}`);

/**
 * Datasets of the manuscript (measurements first; derived fit tables are reached through their analyses),
 * plus the older versions a saved revision is still bound to (`pinnedVersionIds`).
 */
export function useBuilderSources(manuscriptId: string, initialDatasets: DatasetItem[], analysedVersionIds: string[], pinnedVersionIds: string[] = []) {
  const datasets = useQuery({
    queryKey: queryKeys.datasets(manuscriptId),
    queryFn: async () => (await fetchJson<{ items: DatasetItem[] }>(`/api/manuscripts/${manuscriptId}/datasets`)).items,
    initialData: initialDatasets,
  }).data;
  const latest: Source[] = datasets
    .filter((d) => d.latestVersion && !d.tags?.derivedFrom)
    .map((d) => ({
      kind: "version",
      versionId: d.latestVersion!.id,
      label: `${d.name} · version ${d.latestVersion!.number}`,
      columns: d.latestVersion!.columns,
      measurement: d.kind,
    }));
  const older = [...new Set(pinnedVersionIds)].filter((id) => !latest.some((s) => s.kind === "version" && s.versionId === id)).sort();
  const olderVersions = useQueries({
    queries: older.map((id) => ({ queryKey: ["version", id], queryFn: () => fetchJson<VersionView>(`/api/versions/${id}`), staleTime: Infinity })),
  });
  const versionSources: Source[] = [
    ...latest,
    ...olderVersions.flatMap((q): Source[] => {
      const v = q.data;
      const d = v && datasets.find((x) => x.id === v.datasetId);
      return v && d
        ? [{ kind: "version", versionId: v.id, label: `${d.name} · version ${v.number} (bound; not the newest)`, columns: v.columns, measurement: d.kind }]
        : [];
    }),
  ];
  const nameOfVersion = new Map(versionSources.map((s) => [(s as { versionId: string }).versionId, s.label]));

  const ids = [...new Set(analysedVersionIds)].sort();
  const analyses = useQueries({
    queries: ids.map((id) => ({
      queryKey: queryKeys.analyses(id),
      queryFn: async () => (await fetchJson<{ items: AnalysisItem[] }>(`/api/versions/${id}/analyses`)).items,
    })),
  });
  const analysisSources: Source[] = analyses.flatMap((q, i) =>
    (q.data ?? [])
      .filter((a) => a.derivedVersionId)
      .map((a) => ({
        kind: "analysis" as const,
        analysisId: a.id,
        derivedVersionId: a.derivedVersionId!,
        versionId: ids[i],
        createdAt: String(a.createdAt),
        fit: fitOf(a),
        label: `${a.model} fit of ${(nameOfVersion.get(ids[i]) ?? "").replace(/^.* · /, "") || "the data"}, run ${formatDate(a.createdAt)}`,
      })),
  );

  return { versionSources, analysisSources, loadingAnalyses: analyses.some((q) => q.isLoading) };
}

/** Columns of a chosen source; an analysis output's come from its derived version, fetched for the analyses picked. */
export function useSourceColumns(derivedVersionIds: string[]) {
  const derived = [...new Set(derivedVersionIds)].sort();
  const derivedVersions = useQueries({
    queries: derived.map((id) => ({ queryKey: ["version", id], queryFn: () => fetchJson<VersionView>(`/api/versions/${id}`), staleTime: Infinity })),
  });
  return (s: Source | undefined): ColumnInfo[] => {
    if (!s) return [];
    if (s.kind === "version") return s.columns;
    const v = derivedVersions[derived.indexOf(s.derivedVersionId)]?.data;
    return (v?.columns ?? []).filter((c) => c.name !== "series");
  };
}
