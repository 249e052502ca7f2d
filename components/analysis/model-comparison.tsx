"use client";
import { useState } from "react";
import { sendJson } from "@/components/api-client";
import { Button, Field, Notice, Select, Sheet, TextInput } from "@/components/ui";
import { axisTitle } from "@/lib/data/format";
import type { ComparisonResult, FitOptions, ModelInfo } from "./api";
import { ComparisonTables } from "./comparison-tables";
import { ModelOptions } from "./model-and-columns";
import { ResidualStrips } from "./residual-strips";

const MAX_CANDIDATES = 4;

/** One candidate as typed: a model, and optionally one parameter held at a value. */
interface CandidateDraft {
  model: string;
  hold: string;
  value: string;
}

interface Props {
  versionId: string;
  kind: string;
  models: ModelInfo[];
  /** The model chosen above: the first two candidates start from it. */
  modelId: string;
  /** The columns and fit window chosen above, or why they cannot be used yet. */
  columns: Pick<FitOptions, "x" | "y" | "sigma" | "xRange"> | { error: string };
  units: { x: string | null; y: string | null };
}

/** Two first candidates: the chosen model free and, when it has a stretch exponent n, with n held at 1. */
function firstCandidates(models: ModelInfo[], modelId: string): CandidateDraft[] {
  const model = models.find((m) => m.id === modelId);
  const free = { model: modelId, hold: "", value: "" };
  if (model?.parameters.some((p) => p.name === "n")) return [free, { model: modelId, hold: "n", value: "1" }];
  return [free, { model: modelId, hold: "", value: "" }];
}

const labelOf = (d: CandidateDraft, models: ModelInfo[]) => {
  const title = models.find((m) => m.id === d.model)?.title ?? d.model;
  return d.hold ? `${title}, ${d.hold} = ${d.value.trim()}` : title;
};

/** The drafts as the API's candidates, or the first thing wrong with them in words. */
function buildCandidates(drafts: CandidateDraft[], models: ModelInfo[]) {
  const candidates = [];
  for (const [i, d] of drafts.entries()) {
    const fixed: Record<string, number> = {};
    if (d.hold) {
      const v = Number(d.value.trim());
      if (!d.value.trim() || !Number.isFinite(v)) return { error: `Candidate ${i + 1}: give the value ${d.hold} is held at (a number).` };
      fixed[d.hold] = v;
    }
    candidates.push({ label: labelOf(d, models), model: d.model, ...(d.hold ? { fixed } : {}) });
  }
  const labels = candidates.map((c) => c.label);
  const twice = labels.findIndex((l, i) => labels.indexOf(l) !== i);
  if (twice >= 0)
    return { error: `Candidates ${labels.indexOf(labels[twice]) + 1} and ${twice + 1} are the same (${labels[twice]}): change the model or hold a parameter.` };
  return { candidates };
}

/**
 * Fit two to four candidates (other models, or one model with a parameter held, as n = 1, 2, 3)
 * to the columns and window chosen above, and see which the data support and why. Nothing is stored.
 */
export function ModelComparison({ versionId, kind, models, modelId, columns, units }: Props) {
  const [drafts, setDrafts] = useState<CandidateDraft[]>(() => firstCandidates(models, modelId));
  const [result, setResult] = useState<ComparisonResult | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const update = (i: number, change: Partial<CandidateDraft>) => setDrafts((all) => all.map((d, j) => (j === i ? { ...d, ...change } : d)));

  async function run() {
    setError(null);
    if ("error" in columns) return setError(columns.error);
    const built = buildCandidates(drafts, models);
    if ("error" in built) return setError(built.error ?? null);
    setBusy(true);
    try {
      setResult(await sendJson<ComparisonResult>("/api/analyses/compare", "POST", { versionId, options: columns, candidates: built.candidates }));
    } catch (err) {
      setResult(null);
      setError((err as Error).message);
    } finally {
      setBusy(false);
    }
  }

  return (
    <section aria-labelledby="compare-heading">
      <Sheet>
        <h2 id="compare-heading" className="text-lg font-semibold">
          Compare fits
        </h2>
        <p className="mb-3 mt-1 text-sm text-muted">
          Fit two to four candidates to the same columns and fit window as above — other models, or one model with a parameter held (n = 1, 2, 3 …) — and see
          which the data support: χ²ᵣ, AIC and BIC, an F-test where one candidate is the other with parameters held, and the residuals side by side. Nothing is
          stored.
        </p>
        <ol className="space-y-2">
          {drafts.map((d, i) => {
            const model = models.find((m) => m.id === d.model);
            return (
              <li key={i} className="flex flex-wrap items-end gap-3 rounded-sm border border-rule bg-paper px-3 py-2" data-testid="comparison-candidate">
                <span className="pb-2 text-sm font-semibold tabular-nums">{i + 1}.</span>
                <div className="min-w-64 flex-1">
                  <Field label={`Candidate ${i + 1}`}>
                    <Select value={d.model} onChange={(e) => update(i, { model: e.target.value, hold: "", value: "" })}>
                      <ModelOptions models={models} kind={kind} />
                    </Select>
                  </Field>
                </div>
                <div className="w-48">
                  <Field label={`Hold fixed (candidate ${i + 1})`}>
                    <Select value={d.hold} onChange={(e) => update(i, { hold: e.target.value, value: e.target.value ? d.value : "" })}>
                      <option value="">nothing, all free</option>
                      {(model?.parameters ?? []).map((p) => (
                        <option key={p.name} value={p.name}>
                          {p.name}
                        </option>
                      ))}
                    </Select>
                  </Field>
                </div>
                {d.hold ? (
                  <div className="w-32">
                    <Field label={`${d.hold} held at (candidate ${i + 1})`}>
                      <TextInput inputMode="decimal" value={d.value} onChange={(e) => update(i, { value: e.target.value })} />
                    </Field>
                  </div>
                ) : null}
                {drafts.length > 2 ? (
                  <Button
                    type="button"
                    variant="quiet"
                    onClick={() => setDrafts((all) => all.filter((_, j) => j !== i))}
                    aria-label={`Remove candidate ${i + 1}`}
                  >
                    Remove
                  </Button>
                ) : null}
              </li>
            );
          })}
        </ol>
        <div className="mt-3 flex flex-wrap items-center gap-3">
          <Button
            type="button"
            variant="quiet"
            disabled={drafts.length >= MAX_CANDIDATES}
            onClick={() => setDrafts((all) => [...all, { model: all[all.length - 1].model, hold: "", value: "" }])}
          >
            Add candidate
          </Button>
          <Button type="button" onClick={() => void run()} disabled={busy}>
            {busy ? "Comparing…" : "Compare"}
          </Button>
          <span className="text-xs text-muted">
            {drafts.length >= MAX_CANDIDATES ? "Four candidates at most." : `${drafts.length} candidates; up to ${MAX_CANDIDATES}.`}
          </span>
        </div>
        {error ? <Notice ok={false}>{error}</Notice> : null}
        {result ? (
          <div className="mt-5 space-y-5" data-testid="comparison-result">
            <ComparisonTables result={result} />
            <div>
              <h3 className="mb-2 text-sm font-semibold">Residuals, side by side (same scale)</h3>
              <ResidualStrips
                x={result.data.x}
                series={result.candidates.map((c) => ({ label: c.label, residuals: c.residuals, preferred: c.label === result.preferred }))}
                xTitle={axisTitle(result.options.x, units.x)}
                yTitle={axisTitle("residual", units.y)}
              />
            </div>
          </div>
        ) : null}
      </Sheet>
    </section>
  );
}
