"use client";
import Link from "next/link";
import { Field, Select, TextInput } from "@/components/ui";
import { formatDate } from "@/lib/data/format";
import { matchesQuery } from "@/lib/data/search-match";
import { DEFAULT_OUTPUT, FALLBACK_NAME, type DataField, type Output } from "./builder-model";
import { SearchablePicker, type PickerGroup } from "./searchable-picker";
import { sourceKey, type Source, type VersionSource } from "./use-builder-sources";

type AnalysisSource = Extract<Source, { kind: "analysis" }>;

const tagWords = (tags: Record<string, string>) => Object.entries(tags).map(([k, v]) => `${k}=${v}`);
const factsLine = (v: VersionSource) =>
  [v.measurement, v.sample ? `sample ${v.sample}` : null, ...tagWords(v.tags), `version ${v.number}`, formatDate(v.createdAt)].filter(Boolean).join(" · ");

/** Measured data: one group per dataset, the most recently measured first, its versions newest first. */
function versionGroups(versions: VersionSource[]): PickerGroup[] {
  const byDataset = new Map<string, VersionSource[]>();
  for (const v of versions) byDataset.set(v.datasetId, [...(byDataset.get(v.datasetId) ?? []), v]);
  const named = new Map<string, number>();
  for (const vs of byDataset.values()) named.set(vs[0].dataset, (named.get(vs[0].dataset) ?? 0) + 1);
  // Datasets sharing a name are told apart by sample (or kind) and the start of their id.
  const labelOf = (v: VersionSource) => (named.get(v.dataset)! > 1 ? `${v.dataset} (${v.sample ?? v.measurement}, ${v.datasetId.slice(0, 6)})` : v.dataset);
  // Datasets with the newest version first; within one, its versions newest first.
  const newestAt = (vs: VersionSource[]) => vs.reduce((m, v) => (v.createdAt > m ? v.createdAt : m), "");
  const ordered = [...byDataset.values()].sort((a, b) => newestAt(b).localeCompare(newestAt(a)));
  return ordered.map((vs) => ({
    key: vs[0].datasetId,
    label: labelOf(vs[0]),
    options: vs
      .sort((a, b) => b.number - a.number)
      .map((v) => ({
        value: sourceKey(v),
        label: v.label,
        detail: `${factsLine(v)}${v.newest ? "" : " · not the newest"}`,
        search: [v.dataset, v.measurement, v.sample ?? "", ...tagWords(v.tags)],
      })),
  }));
}

/** Stored fits: one group per fitted version, newest run first. */
function fitGroups(runs: AnalysisSource[], versions: VersionSource[]): PickerGroup[] {
  const groups = new Map<string, PickerGroup>();
  for (const r of runs) {
    const v = versions.find((x) => x.versionId === r.versionId);
    const g = groups.get(r.versionId) ?? { key: r.versionId, label: v ? `Fits of ${v.label}` : "Fits", options: [] };
    g.options.push({
      value: sourceKey(r),
      label: r.label,
      detail: [r.fit.model, v ? factsLine(v) : null, `run ${formatDate(r.createdAt)}`].filter(Boolean).join(" · "),
      search: v ? [v.dataset, v.measurement, v.sample ?? "", r.fit.model, ...tagWords(v.tags)] : [r.fit.model],
    });
    groups.set(r.versionId, g);
  }
  return [...groups.values()];
}

/** The fit page for a version, with the way back to this builder (the run stored there is then chosen). */
function fitPageHref(versionId: string, panelId: string, templateId: string): string {
  const back = `/panels/${panelId}?tab=builder&version=${encodeURIComponent(versionId)}&template=${encodeURIComponent(templateId)}`;
  return `/versions/${encodeURIComponent(versionId)}/fit?returnTo=${encodeURIComponent(back)}`;
}

/** The Data fieldset: searchable pickers for the measured data and its stored fits, outputs and data names. */
export function BuilderDataFields({
  fields,
  pickOf,
  chosen,
  outputs,
  onOutput,
  versions,
  runs,
  versionIdsPicked,
  loadingRuns,
  dataNameOf,
  onDataName,
  onPick,
  onSearchDatasets,
  panelId,
  templateId,
}: {
  fields: DataField[];
  pickOf: (f: DataField) => string | null | undefined;
  chosen: (key: string) => Source | undefined;
  outputs: Record<string, Output>;
  onOutput: (key: string, o: Output) => void;
  versions: VersionSource[];
  runs: AnalysisSource[];
  versionIdsPicked: string[];
  loadingRuns: boolean;
  dataNameOf: (f: DataField) => string | undefined;
  onDataName: (key: string, name: string) => void;
  onPick: (f: DataField, value: string | null) => void;
  /** The datasets a search narrowed the list to, so their older versions can be listed too. */
  onSearchDatasets: (datasetIds: string[]) => void;
  panelId: string;
  templateId: string;
}) {
  const measured = versionGroups(versions);
  const fits = fitGroups(
    runs.filter((r) => versionIdsPicked.includes(r.versionId)),
    versions,
  );
  const unfitted = !loadingRuns && versionIdsPicked.length > 0 && fits.length === 0 ? versionIdsPicked[0] : null;
  const unfittedLabel = unfitted ? versions.find((v) => v.versionId === unfitted)?.label : undefined;
  const firstFitKey = fields.find((f) => f.binds !== "dataset")?.key;
  return (
    <fieldset className="space-y-3">
      <legend className="mb-2 text-sm font-semibold">Data</legend>
      {fields.map((f) => {
        const s = chosen(f.key);
        const isMeasured = f.binds === "dataset";
        return (
          <div key={f.key} className="grid gap-2 sm:grid-cols-[minmax(0,1fr)_8rem_8rem] sm:items-start">
            <div>
              <SearchablePicker
                label={f.label}
                hint={f.help}
                value={pickOf(f) ?? null}
                groups={isMeasured ? measured : fits}
                noneLabel={f.required ? undefined : "(none)"}
                empty={
                  isMeasured
                    ? "No measured data in this manuscript yet."
                    : versionIdsPicked.length
                      ? loadingRuns
                        ? "loading stored fits…"
                        : "No stored fit of the chosen data."
                      : "Choose the measured data first."
                }
                onChange={(v) => onPick(f, v)}
                onQuery={
                  isMeasured
                    ? (q) =>
                        onSearchDatasets(
                          q.trim()
                            ? versions
                                .filter((v) => v.newest && matchesQuery(q, [v.dataset, v.measurement, v.sample, ...tagWords(v.tags)]))
                                .map((v) => v.datasetId)
                                .slice(0, 8)
                            : [],
                        )
                    : undefined
                }
              />
              {f.key === firstFitKey && unfitted ? (
                <p className="mt-1 text-xs" data-testid="fit-this-version">
                  {unfittedLabel ?? "The chosen version"} has no stored fit.{" "}
                  <Link className="underline" href={fitPageHref(unfitted, panelId, templateId)}>
                    Fit this version
                  </Link>{" "}
                  — you come back here with the new run chosen.
                </p>
              ) : null}
            </div>
            {s?.kind === "analysis" ? (
              <Field label="Output">
                <Select value={outputs[f.key] ?? DEFAULT_OUTPUT[f.binds]} onChange={(e) => onOutput(f.key, e.target.value as Output)}>
                  <option value="curve">fitted curve</option>
                  <option value="residuals">residuals</option>
                  <option value="data">fitted data</option>
                </Select>
              </Field>
            ) : (
              <span />
            )}
            <Field label="Data name">
              <TextInput value={dataNameOf(f) ?? f.default ?? FALLBACK_NAME[f.binds]} onChange={(e) => onDataName(f.key, e.target.value)} />
            </Field>
          </div>
        );
      })}
    </fieldset>
  );
}
