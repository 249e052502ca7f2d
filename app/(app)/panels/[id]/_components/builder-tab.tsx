"use client";
import { useState } from "react";
import type { DatasetItem } from "@/components/figures/api";
import type { BindingChoice } from "@/components/figures/use-preview-data";
import { Button, Field, Select, TextInput } from "@/components/ui";
import { FIGURE_TEMPLATES, PRINT_OPTION_FIELDS, type TemplateOptionField } from "@/lib/figures/templates";
import { OptionInput, type ColumnInfo } from "./option-input";
import { sourceKey, useBuilderSources, useSourceColumns, type Source } from "./use-builder-sources";

type DataField = Extract<TemplateOptionField, { kind: "data-name" }>;
type Output = "curve" | "residuals" | "data";
const FALLBACK_NAME = { dataset: "data", "analysis-curve": "fit", "analysis-residuals": "residuals" } as const;
const DEFAULT_OUTPUT: Record<DataField["binds"], Output> = { dataset: "data", "analysis-curve": "curve", "analysis-residuals": "residuals" };
const SIGMA = /^(sigma|σ|err|error|stderr|uncertainty)$/i;

/** Templates for the field's plots: pick data and options, and "Generate spec" fills the editor with ordinary Vega-Lite. */
export function BuilderTab({
  manuscriptId,
  datasets,
  defaultWidthMm,
  onGenerate,
}: {
  manuscriptId: string;
  datasets: DatasetItem[];
  defaultWidthMm: number;
  onGenerate: (specText: string, choices: Record<string, BindingChoice>) => void;
}) {
  const [templateId, setTemplateId] = useState(FIGURE_TEMPLATES[0].id);
  const [values, setValues] = useState<Record<string, unknown>>({});
  const [picks, setPicks] = useState<Record<string, string | null>>({});
  const [outputs, setOutputs] = useState<Record<string, Output>>({});
  const [problem, setProblem] = useState<string | null>(null);
  const template = FIGURE_TEMPLATES.find((t) => t.id === templateId)!;
  const dataFields = template.options.filter((f): f is DataField => f.kind === "data-name");

  const versionIdsPicked = dataFields
    .map((f) => picks[f.key])
    .filter((p): p is string => Boolean(p?.startsWith("v:")))
    .map((p) => p.slice(2));
  const src = useBuilderSources(manuscriptId, datasets, versionIdsPicked);
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

  const fieldByKey = new Map(template.options.map((f) => [f.key, f]));
  const columnsFor = (f: TemplateOptionField): ColumnInfo[] => (f.kind === "column" ? columnsOf(chosen(f.dataKey)) : []);
  const columnValue = (f: Extract<TemplateOptionField, { kind: "column" }>): string => {
    if (values[f.key] !== undefined) return String(values[f.key]);
    const cols = columnsFor(f);
    if (f.default && (cols.length === 0 || cols.some((c) => c.name === f.default))) return f.default;
    if (f.required) return cols.find((c) => c.type === "number")?.name ?? cols[0]?.name ?? "";
    if (f.key === "sigmaField") return cols.find((c) => SIGMA.test(c.name))?.name ?? "";
    return "";
  };
  const set = (key: string, v: unknown) => setValues((s) => ({ ...s, [key]: v }));
  /** The data name typed for a data field (its input stores strings only). */
  const dataNameOf = (f: DataField) => values[f.key] as string | undefined;

  function generate() {
    setProblem(null);
    const opts: Record<string, unknown> = {};
    const choices: Record<string, BindingChoice> = {};
    for (const f of template.options) {
      if (f.kind === "data-name") {
        const s = chosen(f.key);
        if (!s) {
          if (f.required) return setProblem(`${f.label}: choose the data to bind.`);
          opts[f.key] = "";
          continue;
        }
        const name = dataNameOf(f) || f.default || FALLBACK_NAME[f.binds];
        if (choices[name]) return setProblem(`Two data sources are named “${name}”; give one another name.`);
        opts[f.key] = name;
        choices[name] =
          s.kind === "version"
            ? { versionId: s.versionId, rowsVersionId: s.versionId }
            : { analysisId: s.analysisId, output: outputs[f.key] ?? DEFAULT_OUTPUT[f.binds], rowsVersionId: s.derivedVersionId };
      } else if (f.kind === "column") opts[f.key] = columnValue(f);
      else opts[f.key] = values[f.key] ?? f.default;
    }
    opts.print = Object.fromEntries(
      PRINT_OPTION_FIELDS.map((p) => [
        p.key.slice("print.".length),
        values[p.key] ?? (p.key === "print.widthMm" ? defaultWidthMm : (p as { default?: unknown }).default),
      ]),
    );
    try {
      onGenerate(JSON.stringify(template.build(opts), null, 2), choices);
    } catch (e) {
      setProblem(`The template could not build a spec: ${(e as Error).message}`);
    }
  }

  const columnFields = template.options.filter((f) => f.kind === "column");
  const otherFields = template.options.filter((f) => f.kind !== "column" && f.kind !== "data-name");
  return (
    <div className="space-y-5" data-testid="builder">
      <div className="grid gap-3 sm:grid-cols-[21rem_minmax(0,1fr)] sm:items-end">
        <Field label="Template">
          <Select
            value={templateId}
            onChange={(e) => {
              setTemplateId(e.target.value);
              setValues({});
              setPicks({});
              setOutputs({});
              setProblem(null);
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

      <fieldset className="space-y-3">
        <legend className="mb-2 text-sm font-semibold">Data</legend>
        {dataFields.map((f) => {
          const s = chosen(f.key);
          const options = f.binds === "dataset" ? src.versionSources : src.analysisSources;
          return (
            <div key={f.key} className="grid gap-2 sm:grid-cols-[minmax(0,1fr)_8rem_8rem] sm:items-start">
              <Field label={f.label} hint={f.help}>
                <Select value={pickOf(f) ?? ""} onChange={(e) => setPicks((p) => ({ ...p, [f.key]: e.target.value || null }))}>
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
              <OptionInput key={f.key} field={f} value={columnValue(f)} onChange={(v) => set(f.key, v)} columns={columnsFor(f)} />
            ))}
          </div>
        </fieldset>
      ) : null}

      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Axes and marks</legend>
        <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {otherFields.map((f) => (
            <OptionInput key={`${templateId}-${f.key}`} field={fieldByKey.get(f.key)!} value={values[f.key]} onChange={(v) => set(f.key, v)} />
          ))}
        </div>
      </fieldset>

      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Print size</legend>
        <div className="grid grid-cols-2 gap-3 lg:grid-cols-4">
          {PRINT_OPTION_FIELDS.map((f) => (
            <OptionInput
              key={f.key}
              field={f}
              value={values[f.key] ?? (f.key === "print.widthMm" ? Math.round(defaultWidthMm * 10) / 10 : (f as { default?: unknown }).default)}
              onChange={(v) => set(f.key, v)}
            />
          ))}
        </div>
      </fieldset>

      {problem ? (
        <p role="alert" className="text-sm text-bad">
          <span aria-hidden>✕ </span>
          {problem}
        </p>
      ) : null}
      <div className="flex items-center gap-3">
        <Button type="button" onClick={generate}>
          Generate spec
        </Button>
        <span className="text-xs text-muted">Fills the spec editor (you can undo there) and binds the data; nothing is saved until you save a revision.</span>
      </div>
    </div>
  );
}
