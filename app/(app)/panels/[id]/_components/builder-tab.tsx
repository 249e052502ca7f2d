"use client";
import { useMutation, useQuery } from "@tanstack/react-query";
import { useParams, useSearchParams } from "next/navigation";
import { useMemo, useState } from "react";
import { fetchJson, sendJson } from "@/components/api-client";
import { queryKeys, type DatasetItem, type PanelView, type RevisionView } from "@/components/figures/api";
import { toBinding, usePreviewData, type BindingChoice } from "@/components/figures/use-preview-data";
import { Button } from "@/components/ui";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { DATA_DEFAULT_KEYS, dataDefaults, templateForKind, type DataFacts } from "@/lib/figures/plots/data-defaults";
import { withFitValue } from "@/lib/figures/fit-value-layer";
import { readTemplateRecord } from "@/lib/figures/template-record";
import { FIGURE_TEMPLATES, PRINT_OPTION_FIELDS, type TemplateOptionField } from "@/lib/figures/templates";
import { initialState, templateOf, type DataField, type Output, type ReturnedFrom, type Saved } from "./builder-model";
import { BuilderDataFields } from "./builder-data-fields";
import { BuilderFitValue, useFitValue } from "./builder-fit-value";
import { BuilderHandEdits, BuilderRecordNotices } from "./builder-hand-edits";
import { BuilderOptionFields } from "./builder-option-fields";
import { BuilderPreview } from "./builder-preview";
import { BuilderTemplateRow } from "./builder-template-row";
import type { ColumnInfo } from "./option-input";
import { SaveRevisionBar } from "./save-revision-bar";
import { useBuiltSpec } from "./use-built-spec";
import { sourceKey, useBuilderSources, useSourceColumns, type Source } from "./use-builder-sources";

interface BuilderProps {
  manuscriptId: string;
  datasets: DatasetItem[];
  defaultWidthMm: number;
  onGenerate: (specText: string, choices: Record<string, BindingChoice>) => void;
  panelId?: string;
  revision?: Saved | null;
  baseRevisionId?: string | null;
  onSaved?: (r: RevisionView) => void;
}

/**
 * Templates for the field's plots, with a live preview. Opening a panel loads the template, options and data
 * its current revision was built with; hand edits made since in the spec editor are kept and listed, and the
 * builder says which of its fields they overrule. Saving makes a new revision with the options recorded in it.
 *
 * `panelId`, `revision` and `onSaved` wire saving into the panel workspace; without them the panel and its
 * current revision are read from the route and the shared panel query, and the spec goes to the spec editor
 * (`onGenerate`) to be saved there — the record travels in the spec either way. Coming back from the fit page
 * (`?version=…&bind=…`) chooses that version and the run just stored.
 */
export function BuilderTab(props: BuilderProps) {
  const params = useParams<{ id?: string }>();
  const search = useSearchParams();
  const panelId = props.panelId ?? params.id ?? "";
  const panel = useQuery({
    queryKey: queryKeys.panel(panelId),
    queryFn: () => fetchJson<PanelView>(`/api/panels/${panelId}`),
    enabled: props.revision === undefined && Boolean(panelId),
  }).data;
  const saved: Saved | null = props.revision !== undefined ? props.revision : (panel?.currentRevision ?? null);
  const key = saved?.id ?? "none";
  // The return from the fit page applies to the form it opened; a revision saved since starts from what it recorded.
  const [returned] = useState(() => ({ key, back: { versionId: search.get("version"), analysisId: search.get("bind"), templateId: search.get("template") } }));
  const back: ReturnedFrom | undefined = returned.key === key ? returned.back : undefined;
  return <BuilderForm key={key} {...props} panelId={panelId} saved={saved} back={back} />;
}

function BuilderForm({
  manuscriptId,
  datasets,
  defaultWidthMm,
  onGenerate,
  panelId,
  saved,
  back,
  baseRevisionId,
  onSaved,
}: Omit<BuilderProps, "panelId" | "revision"> & { panelId: string; saved: Saved | null; back?: ReturnedFrom }) {
  const [start] = useState(() => initialState(saved, back));
  const [templateId, setTemplateId] = useState(start.templateId);
  const [values, setValues] = useState<Record<string, unknown>>(start.values);
  const [picks, setPicks] = useState<Record<string, string | null>>(start.picks);
  const [outputs, setOutputs] = useState<Record<string, Output>>(start.outputs);
  const [dropEdits, setDropEdits] = useState(false);
  const [expandIds, setExpandIds] = useState<string[]>([]);
  // Defaults follow the data until a revision's recorded options are loaded; new data or a new template follow it again.
  const [followData, setFollowData] = useState(Object.keys(start.values).length === 0);
  const [message, setMessage] = useState("");
  const template = useMemo(() => withFitValue(templateOf(templateId)), [templateId]);
  const record = saved ? readTemplateRecord(saved.spec) : null;
  const recordTemplate = record ? FIGURE_TEMPLATES.find((t) => t.id === record.id) : undefined;
  const dataFields = template.options.filter((f): f is DataField => f.kind === "data-name");

  const pinned = Object.values(saved?.bindings ?? {}).flatMap((b) => ("versionId" in b ? [b.versionId] : []));
  const versionIdsPicked = dataFields
    .map((f) => picks[f.key])
    .filter((p): p is string => Boolean(p?.startsWith("v:")))
    .map((p) => p.slice(2));
  const src = useBuilderSources(manuscriptId, datasets, versionIdsPicked, [...pinned, ...versionIdsPicked], expandIds);
  const all: Source[] = [...src.versionSources, ...src.analysisSources];

  // A fit nobody has chosen yet (undefined, not "(none)") reads as the newest analysis of the measured data.
  const newest = src.analysisSources.find((a) => versionIdsPicked.includes(a.versionId));
  const newestKey = newest ? sourceKey(newest) : null;
  const pickOf = (f: DataField) => (picks[f.key] !== undefined || f.binds === "dataset" ? picks[f.key] : newestKey);
  const chosen = (key: string) => {
    const f = dataFields.find((d) => d.key === key);
    return f ? all.find((s) => sourceKey(s) === pickOf(f)) : undefined;
  };

  const columnsOf = useSourceColumns(
    dataFields
      .map((f) => chosen(f.key))
      .filter((s): s is Extract<Source, { kind: "analysis" }> => s?.kind === "analysis")
      .map((s) => s.derivedVersionId),
  );
  const columnsFor = (f: TemplateOptionField): ColumnInfo[] => (f.kind === "column" ? columnsOf(chosen(f.dataKey)) : []);

  // Defaults that follow the measured data: its kind, its columns' units, its stored fit.
  const measured = dataFields.find((f) => f.binds === "dataset");
  const measuredSource = measured ? chosen(measured.key) : undefined;
  const fitField = dataFields.find((f) => f.binds === "analysis-curve");
  const fitSource = fitField ? chosen(fitField.key) : undefined;
  const facts: DataFacts | null =
    measuredSource?.kind === "version"
      ? {
          kind: measuredSource.measurement,
          columns: measuredSource.columns,
          fit: fitSource?.kind === "analysis" ? fitSource.fit : newest ? newest.fit : null,
        }
      : null;
  const auto = facts && followData ? dataDefaults(template, facts) : {};
  const suggested = facts ? templateForKind(facts.kind) : null;

  const columnValue = (f: Extract<TemplateOptionField, { kind: "column" }>): string => {
    if (values[f.key] !== undefined) return String(values[f.key]);
    if (typeof auto[f.key] === "string") return auto[f.key] as string;
    const cols = columnsFor(f);
    if (f.default && (cols.length === 0 || cols.some((c) => c.name === f.default))) return f.default;
    if (f.required) return cols.find((c) => c.type === "number")?.name ?? cols[0]?.name ?? "";
    return "";
  };
  const valueOf = (f: TemplateOptionField): unknown => values[f.key] ?? auto[f.key] ?? ("default" in f ? f.default : undefined);
  const printValue = (f: TemplateOptionField): unknown =>
    values[f.key] ?? (f.key === "print.widthMm" ? Math.round(defaultWidthMm * 10) / 10 : (f as { default?: unknown }).default);
  const set = (key: string, v: unknown) => setValues((s) => ({ ...s, [key]: v }));
  const dataNameOf = (f: DataField) => values[f.key] as string | undefined;

  const fitValue = useFitValue(saved, record, src.analysisSources, fitSource?.kind === "analysis" ? fitSource : undefined, newest);
  const built = useBuiltSpec(template, saved, record, recordTemplate?.id ?? null, dropEdits, {
    chosen,
    dataNameOf,
    outputs,
    columnValue,
    valueOf,
    printValue,
    extra: fitValue.extra,
  });

  // The spec and choices are rebuilt on every render: the preview gets them by value, so it redraws only when they change.
  const specText = built.spec && !built.problem ? canonicalJson(built.spec) : null;
  const previewSpec = useMemo(() => (specText ? (JSON.parse(specText) as unknown) : null), [specText]);
  const choicesText = JSON.stringify(built.choices);
  const previewChoices = useMemo(() => JSON.parse(choicesText) as Record<string, BindingChoice>, [choicesText]);
  const savedRef = useMemo(() => (saved ? { id: saved.id, bindings: saved.bindings } : null), [saved]);
  const preview = usePreviewData(previewChoices, savedRef);
  const bindings = Object.fromEntries(Object.entries(built.choices).map(([n, c]) => [n, toBinding(c)]));
  const unchanged = saved !== null && specText !== null && specText === canonicalJson(saved.spec) && canonicalJson(bindings) === canonicalJson(saved.bindings);

  const save = useMutation({
    mutationFn: () =>
      sendJson<RevisionView>(`/api/panels/${panelId}/revisions`, "POST", {
        spec: built.spec,
        bindings,
        baseRevisionId: baseRevisionId ?? saved?.id ?? null,
        message: message || "Built with the builder",
      }),
    onSuccess: (r) => onSaved?.(r),
  });

  const allFields = [...template.options, ...PRINT_OPTION_FIELDS];
  const withHint = (f: TemplateOptionField): TemplateOptionField =>
    built.overridden.has(f.key) ? { ...f, help: "edited by hand in the spec: changing this here changes nothing drawn" } : f;
  const keepPrint = () => setValues((v) => Object.fromEntries(Object.entries(v).filter(([k]) => k.startsWith("print."))));
  const pickData = (f: DataField, value: string | null) => {
    setPicks((p) => ({ ...p, [f.key]: value }));
    if (f.binds !== "dataset") return;
    setFollowData(true);
    // New measured data: its columns, names and markers follow it again, unless typed by hand since.
    setValues((v) =>
      Object.fromEntries(Object.entries(v).filter(([k]) => !DATA_DEFAULT_KEYS.has(k) && !template.options.some((o) => o.key === k && o.kind === "column"))),
    );
  };
  const generate = () => onGenerate(JSON.stringify(built.spec, null, 2), built.choices);

  return (
    <div className="space-y-5" data-testid="builder">
      <BuilderRecordNotices savedNumber={saved?.number ?? null} recordId={record?.id ?? null} known={Boolean(recordTemplate)} />

      <BuilderTemplateRow
        templateId={templateId}
        onTemplate={(id) => {
          setTemplateId(id);
          setFollowData(true);
          keepPrint();
          setOutputs({});
        }}
        measuredKind={facts?.kind ?? null}
        suggested={suggested && suggested !== templateId && !record ? suggested : null}
        onUseSuggested={(id) => {
          const next = templateOf(id);
          const keep = Object.fromEntries(
            next.options.filter((o) => o.kind === "data-name").map((o) => [o.key, picks[dataFields.find((d) => d.binds === o.binds)?.key ?? ""]]),
          );
          setTemplateId(id);
          setFollowData(true);
          setPicks(Object.fromEntries(Object.entries(keep).filter(([, v]) => v !== undefined)));
          keepPrint();
          setOutputs({});
        }}
      />

      <BuilderDataFields
        fields={dataFields}
        pickOf={pickOf}
        chosen={chosen}
        outputs={outputs}
        onOutput={(key, o) => setOutputs((all) => ({ ...all, [key]: o }))}
        versions={src.versionSources}
        runs={src.analysisSources}
        versionIdsPicked={versionIdsPicked}
        loadingRuns={src.loadingAnalyses}
        dataNameOf={dataNameOf}
        onDataName={set}
        onPick={pickData}
        onSearchDatasets={(ids) => setExpandIds((had) => (ids.every((id) => had.includes(id)) ? had : [...new Set([...had, ...ids])]))}
        panelId={panelId}
        templateId={templateId}
      />

      <BuilderOptionFields
        template={template}
        withHint={withHint}
        columnValue={columnValue}
        columnsFor={columnsFor}
        valueOf={valueOf}
        printValue={printValue}
        onChange={set}
      />

      <BuilderFitValue value={fitValue.opt} onChange={fitValue.setOpt} run={fitValue.run} />

      <BuilderHandEdits
        edits={built.edits}
        lost={built.lost}
        dropEdits={dropEdits}
        onDropEdits={setDropEdits}
        savedNumber={saved?.number}
        overriddenLabels={[...built.overridden].map((k) => allFields.find((f) => f.key === k)?.label ?? k)}
      />

      <BuilderPreview spec={previewSpec} data={preview.data} saved={preview.saved} error={preview.error} widthMm={defaultWidthMm} />

      {built.problem ? (
        <p role="alert" className="text-sm text-bad">
          <span aria-hidden>✕ </span>
          {built.problem}
        </p>
      ) : null}
      {onSaved ? (
        <SaveRevisionBar
          formLabel="Save from the builder"
          noteLabel="What changed (revision note)"
          noteHint="For your co-authors; saved with the revision."
          placeholder="e.g. y axis: normalised PL"
          note={message}
          onNote={setMessage}
          revisionNumber={saved ? saved.number : null}
          blocked={Boolean(built.problem) || unchanged}
          pending={save.isPending}
          error={save.error}
          onSave={() => save.mutate()}
        >
          <Button type="button" variant="quiet" disabled={Boolean(built.problem)} onClick={generate}>
            Generate spec
          </Button>
          <span className="text-xs text-muted">“Generate spec” fills the spec editor instead, to edit by hand before saving.</span>
          {unchanged ? <span className="text-xs text-muted">Nothing changed since revision {saved?.number}.</span> : null}
        </SaveRevisionBar>
      ) : (
        <div className="flex items-center gap-3">
          <Button type="button" disabled={Boolean(built.problem)} onClick={generate}>
            Generate spec
          </Button>
          <span className="text-xs text-muted">
            Fills the spec editor (you can undo there) with the builder’s settings recorded in it; save the revision there.
          </span>
        </div>
      )}
    </div>
  );
}
