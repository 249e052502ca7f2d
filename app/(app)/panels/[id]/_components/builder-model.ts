import type { RevisionView } from "@/components/figures/api";
import { readTemplateRecord } from "@/lib/figures/template-record";
import { FIGURE_TEMPLATES, type TemplateOptionField } from "@/lib/figures/templates";

export type DataField = Extract<TemplateOptionField, { kind: "data-name" }>;
export type Output = "curve" | "residuals" | "data";
export type Saved = Pick<RevisionView, "id" | "number" | "spec" | "bindings" | "bound">;
export const FALLBACK_NAME = { dataset: "data", "analysis-curve": "fit", "analysis-residuals": "residuals" } as const;
export const DEFAULT_OUTPUT: Record<DataField["binds"], Output> = { dataset: "data", "analysis-curve": "curve", "analysis-residuals": "residuals" };
export const KIND_WORDS: Record<string, string> = {
  odmr: "an ODMR sweep",
  pl_spectrum: "a PL spectrum",
  hahn_echo: "a Hahn echo",
  decoupling: "a CPMG or XY-N echo",
  relaxation: "a T₁ relaxation",
  ramsey: "a Ramsey measurement",
  nv_nmr: "an NV-NMR spectrum",
  pl_map: "a PL map",
};
export const templateOf = (id: string) => FIGURE_TEMPLATES.find((t) => t.id === id) ?? FIGURE_TEMPLATES[0];
export const short = (v: unknown) => {
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

/** Where the builder was sent back to from the fit page: the measured version, the new run, the template. */
export interface ReturnedFrom {
  versionId: string | null;
  analysisId: string | null;
  templateId: string | null;
}

/**
 * What the builder starts from: the saved revision's template, options and data when it recorded them;
 * a return from the fit page picks the version it left for and the run stored there.
 */
export function initialState(saved: Saved | null, back?: ReturnedFrom) {
  const record = saved ? readTemplateRecord(saved.spec) : null;
  const template = record ? FIGURE_TEMPLATES.find((t) => t.id === record.id) : undefined;
  const start = {
    templateId: FIGURE_TEMPLATES[0].id,
    values: {} as Record<string, unknown>,
    picks: {} as Record<string, string | null>,
    outputs: {} as Record<string, Output>,
  };
  if (saved && record && template) {
    start.templateId = template.id;
    start.values = formValues(record.options);
    for (const f of template.options) {
      if (f.kind !== "data-name") continue;
      const name = record.options[f.key];
      const b = typeof name === "string" && name ? saved.bindings[name] : undefined;
      start.picks[f.key] = !b ? null : "versionId" in b ? `v:${b.versionId}` : `a:${b.analysisId}`;
      if (b && "analysisId" in b && b.output !== "parameters") start.outputs[f.key] = b.output;
    }
  }
  if (back?.versionId || back?.analysisId) {
    if (back.templateId && FIGURE_TEMPLATES.some((t) => t.id === back.templateId)) start.templateId = back.templateId;
    for (const f of templateOf(start.templateId).options) {
      if (f.kind !== "data-name") continue;
      if (f.binds === "dataset" && back.versionId) start.picks[f.key] = `v:${back.versionId}`;
      if (f.binds !== "dataset" && back.analysisId) start.picks[f.key] = `a:${back.analysisId}`;
    }
  }
  return start;
}
