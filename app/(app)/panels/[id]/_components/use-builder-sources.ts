"use client";
import { useQueries, useQuery } from "@tanstack/react-query";
import { fetchJson } from "@/components/api-client";
import type { DatasetDetail, VersionView } from "@/components/data/api";
import { queryKeys, type AnalysisItem, type DatasetItem } from "@/components/figures/api";
import { formatDate } from "@/lib/data/format";
import type { FitFacts } from "@/lib/figures/plots/data-defaults";
import type { ColumnInfo } from "./option-input";

/** What the pickers say about a dataset: its name, kind of measurement, sample and tags. */
export interface DatasetFacts {
  datasetId: string;
  dataset: string;
  measurement: string;
  sample: string | null;
  tags: Record<string, string>;
}

/** A stored run's fitted parameter as the builder shows it. */
export interface FitParameterFacts {
  name: string;
  value: number | null;
  stderr: number | null;
  unit: string | null;
}

/** What a data name can be bound to: a version of a dataset (its kind of measurement known), or an output of a stored analysis (with its fit). */
export type Source =
  | (DatasetFacts & { kind: "version"; versionId: string; number: number; createdAt: string; label: string; columns: ColumnInfo[]; newest: boolean })
  | {
      kind: "analysis";
      analysisId: string;
      derivedVersionId: string;
      label: string;
      versionId: string;
      createdAt: string;
      fit: FitFacts;
      parameters: FitParameterFacts[];
    };
export type VersionSource = Extract<Source, { kind: "version" }>;

const num = (v: unknown) => (typeof v === "number" && Number.isFinite(v) ? v : null);

/** The fitted parameters of a stored run, read from its result (stderr null when fixed or undetermined). */
function parametersOf(a: AnalysisItem): FitParameterFacts[] {
  const params = (a.result as { parameters?: unknown }).parameters;
  if (!Array.isArray(params)) return [];
  return params.flatMap((p: unknown) => {
    const q = p as { name?: unknown; value?: unknown; stderr?: unknown; unit?: unknown; fixed?: unknown };
    if (typeof q.name !== "string") return [];
    return [{ name: q.name, value: num(q.value), stderr: q.fixed === true ? null : num(q.stderr), unit: typeof q.unit === "string" ? q.unit : null }];
  });
}

export const sourceKey = (s: Source) => (s.kind === "version" ? `v:${s.versionId}` : `a:${s.analysisId}`);

const factsOf = (d: DatasetItem | DatasetDetail): DatasetFacts => ({
  datasetId: d.id,
  dataset: d.name,
  measurement: d.kind,
  sample: d.sample ?? null,
  tags: d.tags ?? {},
});

function versionSource(d: DatasetFacts, v: Pick<VersionView, "id" | "number" | "columns" | "createdAt">, newest: boolean): VersionSource {
  return {
    ...d,
    kind: "version",
    versionId: v.id,
    number: v.number,
    createdAt: String(v.createdAt),
    columns: v.columns,
    newest,
    label: `${d.dataset} · version ${v.number}`,
  };
}

/**
 * Versions of the manuscript's measurements (derived fit tables are reached through their analyses; archived
 * datasets and runs are left out): the newest of each, every version of the datasets in `expandDatasetIds`, and
 * the older versions a saved revision is still bound to (`pinnedVersionIds`); stored runs of `analysedVersionIds`.
 */
export function useBuilderSources(
  manuscriptId: string,
  initialDatasets: DatasetItem[],
  analysedVersionIds: string[],
  pinnedVersionIds: string[] = [],
  expandDatasetIds: string[] = [],
) {
  const datasets = useQuery({
    queryKey: queryKeys.datasets(manuscriptId),
    queryFn: async () => (await fetchJson<{ items: DatasetItem[] }>(`/api/manuscripts/${manuscriptId}/datasets`)).items,
    initialData: initialDatasets,
  }).data.filter((d) => !d.archivedAt && !d.tags?.derivedFrom);
  const latest = datasets.filter((d) => d.latestVersion).map((d) => versionSource(factsOf(d), d.latestVersion!, true));
  const expand = [...new Set(expandDatasetIds)].filter((id) => datasets.some((d) => d.id === id && d.versionCount > 1)).sort();
  const details = useQueries({
    queries: expand.map((id) => ({ queryKey: ["dataset", id], queryFn: () => fetchJson<DatasetDetail>(`/api/datasets/${id}`), staleTime: 60_000 })),
  });
  const expanded = details.flatMap((q) => (q.data ? q.data.versions.slice(1).map((v) => versionSource(factsOf(q.data), v, false)) : []));
  const known = new Set([...latest, ...expanded].map((s) => s.versionId));
  const older = [...new Set(pinnedVersionIds)].filter((id) => !known.has(id)).sort();
  const olderVersions = useQueries({
    queries: older.map((id) => ({ queryKey: ["version", id], queryFn: () => fetchJson<VersionView>(`/api/versions/${id}`), staleTime: Infinity })),
  });
  const pinned = olderVersions.flatMap((q): VersionSource[] => {
    const v = q.data;
    const d = v && datasets.find((x) => x.id === v.datasetId);
    return v && d ? [versionSource(factsOf(d), v, false)] : [];
  });
  const versionSources: VersionSource[] = [...latest, ...expanded, ...pinned];

  const ids = [...new Set(analysedVersionIds)].sort();
  const analyses = useQueries({
    queries: ids.map((id) => ({
      queryKey: queryKeys.analyses(id),
      // The same key and shape as the fit page's list of stored runs, so a run stored there shows here at once.
      queryFn: () => fetchJson<{ items: AnalysisItem[] }>(`/api/versions/${id}/analyses`),
    })),
  });
  const analysisSources: Array<Extract<Source, { kind: "analysis" }>> = analyses
    .flatMap((q, i) =>
      (q.data?.items ?? [])
        .filter((a) => a.derivedVersionId && !a.archivedAt)
        .map((a) => {
          const parameters = parametersOf(a);
          return {
            kind: "analysis" as const,
            analysisId: a.id,
            derivedVersionId: a.derivedVersionId!,
            versionId: ids[i],
            createdAt: String(a.createdAt),
            parameters,
            fit: { model: a.model, parameters: parameters.map(({ name, value, unit }) => ({ name, value, unit })) },
            label: `${a.model} fit · run ${formatDate(a.createdAt)} · ${a.id.slice(0, 6)}`,
          };
        }),
    )
    .sort((a, b) => b.createdAt.localeCompare(a.createdAt));

  return { datasets, versionSources, analysisSources, loadingAnalyses: analyses.some((q) => q.isLoading) };
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
