"use client";
import { useMutation, useQuery } from "@tanstack/react-query";
import { useParams } from "next/navigation";
import { useMemo, useState } from "react";
import { ApiError, fetchJson, sendJson } from "@/components/api-client";
import { queryKeys, type DatasetItem, type PanelView, type RevisionView } from "@/components/figures/api";
import { PanelChartLazy } from "@/components/figures/panel-chart-lazy";
import { toBinding, usePreviewData, type BindingChoice } from "@/components/figures/use-preview-data";
import { Button, Field, Select, TextInput } from "@/components/ui";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { DATA_DEFAULT_KEYS, dataDefaults, templateForKind, type DataFacts } from "@/lib/figures/plots/data-defaults";
import { fieldsOverridden, handEditsOf, readTemplateRecord, rebaseHandEdits, withTemplateRecord, type HandEdit } from "@/lib/figures/template-record";
import { FIGURE_TEMPLATES, PRINT_OPTION_FIELDS, type TemplateOptionField } from "@/lib/figures/templates";
import { OptionInput, type ColumnInfo } from "./option-input";
import { sourceKey, useBuilderSources, useSourceColumns, type Source } from "./use-builder-sources";

type DataField = Extract<TemplateOptionField, { kind: "data-name" }>;
type Output = "curve" | "residuals" | "data";
type Saved = Pick<RevisionView, "id" | "number" | "spec" | "bindings" | "bound">;
const FALLBACK_NAME = { dataset: "data", "analysis-curve": "fit", "analysis-residuals": "residuals" } as const;
const DEFAULT_OUTPUT: Record<DataField["binds"], Output> = { dataset: "data", "analysis-curve": "curve", "analysis-residuals": "residuals" };
const KIND_WORDS: Record<string, string> = {
  odmr: "an ODMR sweep",
  pl_spectrum: "a PL spectrum",
  hahn_echo: "a Hahn echo",
  relaxation: "a T₁ relaxation",
  ramsey: "a Ramsey measurement",
  nv_nmr: "an NV-NMR spectrum",
  pl_map: "a PL map",
};
const templateOf = (id: string) => FIGURE_TEMPLATES.find((t) => t.id === id) ?? FIGURE_TEMPLATES[0];
const short = (v: unknown) => {
  const s = JSON.stringify(v) ?? "—";
  return s.length > 48 ? `${s.slice(0, 47)}…` : s;
};

/** The recorded options as the form holds them: print settings flattened to `print.*`. */
function formValues(options: Record<string, unknown>): Record<string, unknown> {
  const { print, ...rest } = options;
  const flat: Record<string, unknown> = { ...rest };
  if (print && typeof print === "object") for (const [k, v] of Object.entries(print)) flat[`print.${k}`] = v;
  return flat;
}

/** What the builder starts from: the saved revision's template, options and data when it recorded them. */
function initialState(saved: Saved | null) {
  const record = saved ? readTemplateRecord(saved.spec) : null;
  const template = record ? FIGURE_TEMPLATES.find((t) => t.id === record.id) : undefined;
  if (!saved || !record || !template) return { templateId: FIGURE_TEMPLATES[0].id, values: {}, picks: {}, outputs: {} };
  const picks: Record<string, string | null> = {};
  const outputs: Record<string, Output> = {};
  for (const f of template.options) {
    if (f.kind !== "data-name") continue;
    const name = record.options[f.key];
    const b = typeof name === "string" && name ? saved.bindings[name] : undefined;
    picks[f.key] = !b ? null : "versionId" in b ? `v:${b.versionId}` : `a:${b.analysisId}`;
    if (b && "analysisId" in b) outputs[f.key] = b.output;
  }
  return { templateId: template.id, values: formValues(record.options), picks, outputs };
}

/**
 * Templates for the field's plots, with a live preview. Opening a panel loads the template, options and data
 * its current revision was built with; hand edits made since in the spec editor are kept and listed, and the
 * builder says which of its fields they overrule. Saving makes a new revision with the options recorded in it.
 *
 * `panelId`, `revision` and `onSaved` wire saving into the panel workspace; without them the panel and its
 * current revision are read from the route and the shared panel query, and the spec goes to the spec editor
 * (`onGenerate`) to be saved there — the record travels in the spec either way.
 */
export function BuilderTab(props: {
  manuscriptId: string;
  datasets: DatasetItem[];
  defaultWidthMm: number;
  onGenerate: (specText: string, choices: Record<string, BindingChoice>) => void;
  panelId?: string;
  revision?: Saved | null;
  baseRevisionId?: string | null;
  onSaved?: (r: RevisionView) => void;
}) {
  const params = useParams<{ id?: string }>();
  const panelId = props.panelId ?? params.id ?? "";
  const panel = useQuery({
    queryKey: queryKeys.panel(panelId),
    queryFn: () => fetchJson<PanelView>(`/api/panels/${panelId}`),
    enabled: props.revision === undefined && Boolean(panelId),
  }).data;
  const saved: Saved | null = props.revision !== undefined ? props.revision : (panel?.currentRevision ?? null);
  // A new revision (saved here or in the spec editor) starts the form again from what it recorded.
  return <BuilderForm key={saved?.id ?? "none"} {...props} panelId={panelId} saved={saved} />;
}

function BuilderForm({
  manuscriptId,
  datasets,
  defaultWidthMm,
  onGenerate,
  panelId,
  saved,
  baseRevisionId,
  onSaved,
}: {
  manuscriptId: string;
  datasets: DatasetItem[];
  defaultWidthMm: number;
  onGenerate: (specText: string, choices: Record<string, BindingChoice>) => void;
  panelId: string;
  saved: Saved | null;
  baseRevisionId?: string | null;
  onSaved?: (r: RevisionView) => void;
}) {
  const [start] = useState(() => initialState(saved));
  const [templateId, setTemplateId] = useState(start.templateId);
  const [values, setValues] = useState<Record<string, unknown>>(start.values);
  const [picks, setPicks] = useState<Record<string, string | null>>(start.picks);
  const [outputs, setOutputs] = useState<Record<string, Output>>(start.outputs);
  const [dropEdits, setDropEdits] = useState(false);
  // Defaults follow the data until a revision's recorded options are loaded; new data or a new template follow it again.
  const [followData, setFollowData] = useState(start.values === undefined || Object.keys(start.values).length === 0);
  const [message, setMessage] = useState("");
  const template = templateOf(templateId);
  const record = saved ? readTemplateRecord(saved.spec) : null;
  const recordTemplate = record ? FIGURE_TEMPLATES.find((t) => t.id === record.id) : undefined;
  const dataFields = template.options.filter((f): f is DataField => f.kind === "data-name");

  const pinned = Object.values(saved?.bindings ?? {}).flatMap((b) => ("versionId" in b ? [b.versionId] : []));
  const versionIdsPicked = dataFields
    .map((f) => picks[f.key])
    .filter((p): p is string => Boolean(p?.startsWith("v:")))
    .map((p) => p.slice(2));
  const src = useBuilderSources(manuscriptId, datasets, versionIdsPicked, pinned);
  const all: Source[] = [...src.versionSources, ...src.analysisSources];

  // A fit nobody has chosen yet (undefined, not "(none)") reads as the newest analysis of the measured data.
  const newest = src.analysisSources.find((a) => a.kind === "analysis" && versionIdsPicked.includes(a.versionId));
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
          fit: fitSource?.kind === "analysis" ? fitSource.fit : newest?.kind === "analysis" ? newest.fit : null,
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

  /** The options, the bindings and the spec (hand edits carried over) the form describes now. */
  const built = (() => {
    const opts: Record<string, unknown> = {};
    const choices: Record<string, BindingChoice> = {};
    let problem: string | null = null;
    for (const f of template.options) {
      if (f.kind === "data-name") {
        const s = chosen(f.key);
        if (!s) {
          if (f.required) problem ??= `${f.label}: choose the data to bind.`;
          opts[f.key] = "";
          continue;
        }
        const name = dataNameOf(f) || f.default || FALLBACK_NAME[f.binds];
        if (choices[name]) problem ??= `Two data sources are named “${name}”; give one another name.`;
        opts[f.key] = name;
        choices[name] =
          s.kind === "version"
            ? { versionId: s.versionId, rowsVersionId: s.versionId }
            : { analysisId: s.analysisId, output: outputs[f.key] ?? DEFAULT_OUTPUT[f.binds], rowsVersionId: s.derivedVersionId };
      } else if (f.kind === "column") {
        opts[f.key] = columnValue(f);
        if (f.required && !opts[f.key]) problem ??= `${f.label}: choose a column.`;
      } else opts[f.key] = valueOf(f);
    }
    if (opts.xField && opts.yField && opts.xField === opts.yField) problem ??= "x and y are the same column; choose another for y.";
    opts.print = Object.fromEntries(PRINT_OPTION_FIELDS.map((p) => [p.key.slice("print.".length), printValue(p)]));
    let spec: unknown = null;
    let edits: HandEdit[] = [];
    let lost: HandEdit[] = [];
    try {
      const generated = template.build(opts);
      spec = generated;
      if (saved && record && recordTemplate && recordTemplate.id === template.id) {
        edits = handEditsOf(template, record.options, saved.spec);
        if (edits.length && !dropEdits) ({ spec, lost } = rebaseHandEdits(template.build(record.options), saved.spec, generated, edits));
      }
      spec = withTemplateRecord(spec as Record<string, unknown>, { id: template.id, options: opts });
    } catch (e) {
      problem ??= `The template could not build a spec: ${(e as Error).message}`;
    }
    return { opts, choices, spec, edits, lost, problem };
  })();

  // Which builder fields the hand edits overrule: a few builds per field, so once per change of options.
  const optsKey = canonicalJson(built.opts);
  const editsKey = dropEdits ? "" : built.edits.map((e) => e.where).join("\n");
  const overridden = useMemo(
    () =>
      editsKey
        ? new Set(fieldsOverridden(template, JSON.parse(optsKey) as Record<string, unknown>, [...template.options, ...PRINT_OPTION_FIELDS], built.edits))
        : new Set<string>(),
    // built.edits is named by editsKey
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [template, optsKey, editsKey],
  );
  // The spec and choices are rebuilt on every render: the preview gets them by value, so it redraws only when they change.
  const specText = built.spec && !built.problem ? canonicalJson(built.spec) : null;
  const previewSpec = useMemo(() => (specText ? (JSON.parse(specText) as unknown) : null), [specText]);
  const choicesText = JSON.stringify(built.choices);
  const previewChoices = useMemo(() => JSON.parse(choicesText) as Record<string, BindingChoice>, [choicesText]);
  const savedRef = useMemo(() => (saved ? { id: saved.id, bindings: saved.bindings } : null), [saved]);
  const preview = usePreviewData(previewChoices, savedRef);
  const unchanged =
    saved !== null &&
    specText !== null &&
    specText === canonicalJson(saved.spec) &&
    canonicalJson(Object.fromEntries(Object.entries(built.choices).map(([n, c]) => [n, toBinding(c)]))) === canonicalJson(saved.bindings);

  const save = useMutation({
    mutationFn: () =>
      sendJson<RevisionView>(`/api/panels/${panelId}/revisions`, "POST", {
        spec: built.spec,
        bindings: Object.fromEntries(Object.entries(built.choices).map(([n, c]) => [n, toBinding(c)])),
        baseRevisionId: baseRevisionId ?? saved?.id ?? null,
        message: message || "Built with the builder",
      }),
    onSuccess: (r) => onSaved?.(r),
  });
  const conflict = save.error instanceof ApiError && save.error.status === 409;

  const withHint = (f: TemplateOptionField): TemplateOptionField =>
    overridden.has(f.key) ? { ...f, help: "edited by hand in the spec: changing this here changes nothing drawn" } : f;
  const columnFields = template.options.filter((f) => f.kind === "column");
  const otherFields = template.options.filter((f) => f.kind !== "column" && f.kind !== "data-name");
  const pickData = (f: DataField, value: string | null) => {
    setPicks((p) => ({ ...p, [f.key]: value }));
    if (f.binds === "dataset") setFollowData(true);
    // New measured data: its columns, names and markers follow it again, unless typed by hand since.
    if (f.binds === "dataset")
      setValues((v) =>
        Object.fromEntries(Object.entries(v).filter(([k]) => !DATA_DEFAULT_KEYS.has(k) && !template.options.some((o) => o.key === k && o.kind === "column"))),
      );
  };

  return (
    <div className="space-y-5" data-testid="builder">
      {saved && !record ? (
        <p className="rounded-sm border border-rule bg-paper p-3 text-sm text-muted" data-testid="builder-no-record">
          Revision {saved.number} was written in the spec editor (or saved before the builder recorded its settings), so the builder starts from the data’s
          defaults. Saving from here replaces its spec with the template’s.
        </p>
      ) : null}
      {saved && record && !recordTemplate ? (
        <p className="rounded-sm border border-warn p-3 text-sm text-warn">
          Revision {saved.number} was built with a template this version of Prooflight does not have (“{record.id}”).
        </p>
      ) : null}

      <div className="grid gap-3 sm:grid-cols-[21rem_minmax(0,1fr)] sm:items-end">
        <Field label="Template">
          <Select
            value={templateId}
            onChange={(e) => {
              setTemplateId(e.target.value);
              setFollowData(true);
              setValues((v) => Object.fromEntries(Object.entries(v).filter(([k]) => k.startsWith("print."))));
              setOutputs({});
            }}
          >
            {FIGURE_TEMPLATES.map((t) => (
              <option key={t.id} value={t.id}>
                {t.title}
              </option>
            ))}
          </Select>
        </Field>
        <p className="pb-1.5 text-sm text-muted">{template.description}</p>
      </div>
      {facts && suggested && suggested !== templateId && !record ? (
        <p className="text-sm" data-testid="template-suggestion">
          This is {KIND_WORDS[facts.kind] ?? "this kind of data"}: {templateOf(suggested).title.toLowerCase()} suits it.{" "}
          <button
            type="button"
            className="underline"
            onClick={() => {
              const next = templateOf(suggested);
              const keep = Object.fromEntries(
                next.options.filter((o) => o.kind === "data-name").map((o) => [o.key, picks[dataFields.find((d) => d.binds === o.binds)?.key ?? ""]]),
              );
              setTemplateId(suggested);
              setFollowData(true);
              setPicks(Object.fromEntries(Object.entries(keep).filter(([, v]) => v !== undefined)));
              setValues((v) => Object.fromEntries(Object.entries(v).filter(([k]) => k.startsWith("print."))));
              setOutputs({});
            }}
          >
            Use it
          </button>
        </p>
      ) : null}

      <fieldset className="space-y-3">
        <legend className="mb-2 text-sm font-semibold">Data</legend>
        {dataFields.map((f) => {
          const s = chosen(f.key);
          const options = f.binds === "dataset" ? src.versionSources : src.analysisSources;
          return (
            <div key={f.key} className="grid gap-2 sm:grid-cols-[minmax(0,1fr)_8rem_8rem] sm:items-start">
              <Field label={f.label} hint={f.help}>
                <Select value={pickOf(f) ?? ""} onChange={(e) => pickData(f, e.target.value || null)}>
                  <option value="">{f.required ? "choose…" : "(none)"}</option>
                  {options.map((o) => (
                    <option key={sourceKey(o)} value={sourceKey(o)}>
                      {o.label}
                    </option>
                  ))}
                  {f.binds !== "dataset" && options.length === 0 ? (
                    <option disabled>
                      {versionIdsPicked.length
                        ? src.loadingAnalyses
                          ? "loading analyses…"
                          : "no stored fit of the chosen data"
                        : "choose the measured data first"}
                    </option>
                  ) : null}
                </Select>
              </Field>
              {s?.kind === "analysis" ? (
                <Field label="Output">
                  <Select value={outputs[f.key] ?? DEFAULT_OUTPUT[f.binds]} onChange={(e) => setOutputs((o) => ({ ...o, [f.key]: e.target.value as Output }))}>
                    <option value="curve">fitted curve</option>
                    <option value="residuals">residuals</option>
                    <option value="data">fitted data</option>
                  </Select>
                </Field>
              ) : (
                <span />
              )}
              <Field label="Data name">
                <TextInput value={dataNameOf(f) ?? f.default ?? FALLBACK_NAME[f.binds]} onChange={(e) => set(f.key, e.target.value)} />
              </Field>
            </div>
          );
        })}
      </fieldset>

      {columnFields.length ? (
        <fieldset>
          <legend className="mb-2 text-sm font-semibold">Columns</legend>
          <div className="grid gap-3 sm:grid-cols-2">
            {columnFields.map((f) => (
              <OptionInput key={f.key} field={withHint(f)} value={columnValue(f)} onChange={(v) => set(f.key, v)} columns={columnsFor(f)} />
            ))}
          </div>
        </fieldset>
      ) : null}

      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Axes and marks</legend>
        <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {otherFields.map((f) => (
            <OptionInput
              key={`${templateId}-${f.key}-${JSON.stringify(f.kind === "markers" ? valueOf(f) : "")}`}
              field={withHint(f)}
              value={valueOf(f)}
              onChange={(v) => set(f.key, v)}
            />
          ))}
        </div>
      </fieldset>

      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Print size</legend>
        <div className="grid grid-cols-2 gap-3 lg:grid-cols-4">
          {PRINT_OPTION_FIELDS.map((f) => (
            <OptionInput key={f.key} field={withHint(f)} value={printValue(f)} onChange={(v) => set(f.key, v)} />
          ))}
        </div>
      </fieldset>

      {built.edits.length ? (
        <section aria-label="Hand edits" className="rounded-sm border border-warn bg-[#fbf4e6] p-3 text-sm" data-testid="hand-edits">
          {dropEdits ? (
            <p>
              The {built.edits.length} hand edit{built.edits.length === 1 ? "" : "s"} of revision {saved?.number} will be dropped when you save: the spec is the
              template’s again.{" "}
              <button type="button" className="underline" onClick={() => setDropEdits(false)}>
                Keep them
              </button>
            </p>
          ) : (
            <>
              <p className="font-semibold text-warn">
                Edited by hand in the spec editor — kept; the builder no longer controls {built.edits.length === 1 ? "this field" : "these fields"} of the spec:
              </p>
              <ul className="mt-1 space-y-0.5 font-mono text-xs">
                {built.edits.map((e) => (
                  <li key={`${e.kind}-${e.where}`}>
                    <code>{e.where}</code> {e.kind === "removed" ? "removed" : e.kind === "added" ? `added: ${short(e.after)}` : `= ${short(e.after)}`}
                    {built.lost.includes(e) ? <span className="font-sans text-bad"> — its place is gone with these options; not kept</span> : null}
                  </li>
                ))}
              </ul>
              {overridden.size ? (
                <p className="mt-1 text-xs text-muted">
                  Builder fields that change nothing drawn because of them:{" "}
                  {[...overridden].map((k) => [...template.options, ...PRINT_OPTION_FIELDS].find((f) => f.key === k)?.label ?? k).join(", ")}.
                </p>
              ) : null}
              <button type="button" className="mt-1 text-xs underline" onClick={() => setDropEdits(true)}>
                Give them back to the builder (drop the hand edits)
              </button>
            </>
          )}
        </section>
      ) : null}

      <section aria-label="Builder preview">
        <h3 className="mb-1 text-sm font-semibold">
          Preview <span className="font-normal text-muted">{preview.saved ? "with the saved data" : "with the chosen data (first 10,000 rows)"}</span>
        </h3>
        <div className="overflow-x-auto rounded-sm border border-rule bg-white p-2" data-testid="builder-preview">
          {previewSpec ? (
            <PanelChartLazy spec={previewSpec} data={preview.data} widthMm={defaultWidthMm} label="Preview of the builder's spec" />
          ) : (
            <p className="text-sm text-muted">The preview appears when the data are chosen.</p>
          )}
        </div>
        {preview.error ? (
          <p role="alert" className="mt-1 text-xs text-bad">
            ✕ {preview.error.message}
          </p>
        ) : null}
      </section>

      {built.problem ? (
        <p role="alert" className="text-sm text-bad">
          <span aria-hidden>✕ </span>
          {built.problem}
        </p>
      ) : null}
      {onSaved ? (
        <form
          className="space-y-2"
          aria-label="Save from the builder"
          onSubmit={(e) => {
            e.preventDefault();
            save.mutate();
          }}
        >
          <Field label="What changed (revision note)" hint="For your co-authors; saved with the revision.">
            <TextInput value={message} onChange={(e) => setMessage(e.target.value)} placeholder="e.g. y axis: normalised PL" />
          </Field>
          <div className="flex flex-wrap items-center gap-3">
            <Button type="submit" disabled={Boolean(built.problem) || unchanged || save.isPending}>
              {save.isPending ? "Saving…" : saved ? `Save as revision ${saved.number + 1}` : "Save revision 1"}
            </Button>
            <Button
              type="button"
              variant="quiet"
              disabled={Boolean(built.problem)}
              onClick={() => onGenerate(JSON.stringify(built.spec, null, 2), built.choices)}
            >
              Generate spec
            </Button>
            <span className="text-xs text-muted">“Generate spec” fills the spec editor instead, to edit by hand before saving.</span>
            {unchanged ? <span className="text-xs text-muted">Nothing changed since revision {saved?.number}.</span> : null}
          </div>
          {conflict ? (
            <p role="alert" className="text-sm text-bad">
              <span aria-hidden>✕ </span>This panel changed since you opened it — reload, then make your change again.
            </p>
          ) : save.isError ? (
            <p role="alert" className="text-sm text-bad">
              <span aria-hidden>✕ </span>
              {save.error.message}
            </p>
          ) : null}
        </form>
      ) : (
        <div className="flex items-center gap-3">
          <Button type="button" disabled={Boolean(built.problem)} onClick={() => onGenerate(JSON.stringify(built.spec, null, 2), built.choices)}>
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
