"use client";
import { useState } from "react";
import type { BindingChoice } from "@/components/figures/use-preview-data";
import { Field, Select, TextInput } from "@/components/ui";
import { headlineParameter, parameterRows } from "@/lib/figures/fit-value";
import { FIT_VALUE_POSITIONS, readFitValueOption, type FitValueOption } from "@/lib/figures/fit-value-layer";
import type { TemplateRecord } from "@/lib/figures/template-record";
import type { Saved } from "./builder-model";
import type { Source } from "./use-builder-sources";

type Run = Extract<Source, { kind: "analysis" }>;
const DEFAULT_NAME = "fitValue";

/**
 * "Show fitted value": one parameter of a stored run written in a corner of the plot. The run is the one the
 * fit fields use (else the one the saved revision bound, else the newest of the measured data); the text
 * comes from the run through a data name bound to its parameters, so it changes, and goes stale, with it.
 */
export function useFitValue(saved: Saved | null, record: TemplateRecord | null, runs: Run[], fitRun: Run | undefined, newest: Run | undefined) {
  const [opt, setOpt] = useState<FitValueOption & { show: boolean }>(() => {
    const o = record ? readFitValueOption(record.options) : null;
    return o ? { ...o, show: true } : { show: false, data: DEFAULT_NAME, parameter: "", position: "top-right" };
  });
  const savedBinding = saved?.bindings[opt.data];
  const savedRun = savedBinding && "analysisId" in savedBinding ? runs.find((r) => r.analysisId === savedBinding.analysisId) : undefined;
  const run = fitRun ?? savedRun ?? newest;
  const parameter = opt.parameter || (run ? (headlineParameter(run.parameters) ?? "") : "");
  const extra: { options: Record<string, unknown>; choices: Record<string, BindingChoice>; problem: string | null } = {
    options: {},
    choices: {},
    problem: null,
  };
  if (opt.show) {
    const data = opt.data.trim() || DEFAULT_NAME;
    if (!run) extra.problem = "Show fitted value: the chosen data has no stored fit yet.";
    else if (!run.parameters.some((p) => p.name === parameter)) extra.problem = `Show fitted value: the run has no parameter “${parameter}”.`;
    else {
      extra.options.fitValue = { data, parameter, position: opt.position };
      extra.choices[data] = { analysisId: run.analysisId, output: "parameters", rowsVersionId: "" };
    }
  }
  return { opt: { ...opt, parameter }, setOpt, run, extra };
}

export function BuilderFitValue({
  value,
  onChange,
  run,
}: {
  value: FitValueOption & { show: boolean };
  onChange: (v: FitValueOption & { show: boolean }) => void;
  run: Run | undefined;
}) {
  const rows = run ? parameterRows(run.fit.model, run.parameters) : [];
  return (
    <fieldset className="space-y-2">
      <legend className="mb-2 text-sm font-semibold">Fitted value in the plot</legend>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" checked={value.show} onChange={(e) => onChange({ ...value, show: e.target.checked })} />
        Show fitted value
      </label>
      {value.show ? (
        <div className="grid gap-3 sm:grid-cols-3">
          <Field label="Parameter" hint={run ? `from ${run.label}` : "Choose measured data with a stored fit."}>
            <Select value={value.parameter} onChange={(e) => onChange({ ...value, parameter: e.target.value })} disabled={!rows.length}>
              {rows.map((r) => (
                <option key={r.name} value={r.name}>
                  {r.text}
                </option>
              ))}
            </Select>
          </Field>
          <Field label="Position">
            <Select value={value.position} onChange={(e) => onChange({ ...value, position: e.target.value as FitValueOption["position"] })}>
              {FIT_VALUE_POSITIONS.map((p) => (
                <option key={p.value} value={p.value}>
                  {p.label}
                </option>
              ))}
            </Select>
          </Field>
          <Field label="Data name of the values">
            <TextInput value={value.data} onChange={(e) => onChange({ ...value, data: e.target.value })} />
          </Field>
        </div>
      ) : null}
    </fieldset>
  );
}
