"use client";
import { useMemo } from "react";
import type { BindingChoice } from "@/components/figures/use-preview-data";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { fieldsOverridden, handEditsOf, rebaseHandEdits, withTemplateRecord, type HandEdit, type TemplateRecord } from "@/lib/figures/template-record";
import { PRINT_OPTION_FIELDS, type FigureTemplate, type TemplateOptionField } from "@/lib/figures/templates";
import { DEFAULT_OUTPUT, FALLBACK_NAME, type DataField, type Output, type Saved } from "./builder-model";
import type { Source } from "./use-builder-sources";

/** How the form reads each kind of option now. */
export interface FormReaders {
  chosen: (key: string) => Source | undefined;
  dataNameOf: (f: DataField) => string | undefined;
  outputs: Record<string, Output>;
  columnValue: (f: Extract<TemplateOptionField, { kind: "column" }>) => string;
  valueOf: (f: TemplateOptionField) => unknown;
  printValue: (f: TemplateOptionField) => unknown;
  /** Options and bindings beside the template's own (the fitted value shown as text). */
  extra: { options: Record<string, unknown>; choices: Record<string, BindingChoice>; problem: string | null };
}

/** The options, the bindings and the spec (hand edits carried over) the form describes now, and the fields hand edits overrule. */
export function useBuiltSpec(
  template: FigureTemplate<any>,
  saved: Saved | null,
  record: TemplateRecord | null,
  recordTemplateId: string | null,
  dropEdits: boolean,
  r: FormReaders,
) {
  const opts: Record<string, unknown> = {};
  const choices: Record<string, BindingChoice> = {};
  let problem: string | null = null;
  for (const f of template.options) {
    if (f.kind === "data-name") {
      const s = r.chosen(f.key);
      if (!s) {
        if (f.required) problem ??= `${f.label}: choose the data to bind.`;
        opts[f.key] = "";
        continue;
      }
      const name = r.dataNameOf(f) || f.default || FALLBACK_NAME[f.binds];
      if (choices[name]) problem ??= `Two data sources are named “${name}”; give one another name.`;
      opts[f.key] = name;
      choices[name] =
        s.kind === "version"
          ? { versionId: s.versionId, rowsVersionId: s.versionId }
          : { analysisId: s.analysisId, output: r.outputs[f.key] ?? DEFAULT_OUTPUT[f.binds], rowsVersionId: s.derivedVersionId };
    } else if (f.kind === "column") {
      opts[f.key] = r.columnValue(f);
      if (f.required && !opts[f.key]) problem ??= `${f.label}: choose a column.`;
    } else opts[f.key] = r.valueOf(f);
  }
  if (opts.xField && opts.yField && opts.xField === opts.yField) problem ??= "x and y are the same column; choose another for y.";
  opts.print = Object.fromEntries(PRINT_OPTION_FIELDS.map((p) => [p.key.slice("print.".length), r.printValue(p)]));
  Object.assign(opts, r.extra.options);
  for (const [name, c] of Object.entries(r.extra.choices)) {
    if (choices[name]) problem ??= `Two data sources are named “${name}”; give one another name.`;
    choices[name] = c;
  }
  problem ??= r.extra.problem;
  let spec: unknown = null;
  let edits: HandEdit[] = [];
  let lost: HandEdit[] = [];
  try {
    const generated = template.build(opts);
    spec = generated;
    if (saved && record && recordTemplateId === template.id) {
      edits = handEditsOf(template, record.options, saved.spec);
      if (edits.length && !dropEdits) ({ spec, lost } = rebaseHandEdits(template.build(record.options), saved.spec, generated, edits));
    }
    spec = withTemplateRecord(spec as Record<string, unknown>, { id: template.id, options: opts });
  } catch (e) {
    problem ??= `The template could not build a spec: ${(e as Error).message}`;
  }

  // Which builder fields the hand edits overrule: a few builds per field, so once per change of options.
  const optsKey = canonicalJson(opts);
  const editsKey = dropEdits ? "" : edits.map((e) => e.where).join("\n");
  const overridden = useMemo(
    () =>
      editsKey
        ? new Set(fieldsOverridden(template, JSON.parse(optsKey) as Record<string, unknown>, [...template.options, ...PRINT_OPTION_FIELDS], edits))
        : new Set<string>(),
    // edits is named by editsKey
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [template, optsKey, editsKey],
  );
  return { opts, choices, spec, edits, lost, problem, overridden };
}
