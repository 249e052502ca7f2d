"use client";
import { useState } from "react";
import { ApiError, sendJson } from "@/components/api-client";
import { Button, Field, Notice, Select, TextInput } from "@/components/ui";
import { resolveUnit } from "@/lib/analysis/param-unit";
import type { GlobalFitResult, ModelInfo } from "./api";
import type { BatchDataset } from "./batch-types";
import { defaultColumns, orderModels } from "./fit-options";
import { DatasetChecklist } from "./dataset-checklist";
import { GlobalFitResultView } from "./global-fit-result";
import { ColumnSelects, kindWords, ModelSelect } from "./model-and-columns";

/** Parameters a group usually shares between curves of one centre (offset and amplitude of a decay). */
const USUALLY_SHARED: Record<string, string[]> = {
  hahn_echo: ["S0", "A"],
  relaxation: ["S0"],
  relaxation_stretched: ["S0"],
  rabi: ["S0"],
};

interface Props {
  manuscriptId: string;
  datasets: BatchDataset[];
  models: ModelInfo[];
  mayRun: boolean;
}

/** Which parameters are shared and which are held, as typed. */
interface ParamChoice {
  shared: boolean;
  fixed: string;
}

function firstKind(datasets: BatchDataset[]): string {
  return datasets.some((d) => d.kind === "hahn_echo") ? "hahn_echo" : (datasets[0]?.kind ?? "hahn_echo");
}

/**
 * One model over several datasets at once: tick the datasets, tick the parameters they share (the
 * rest are fitted per dataset), optionally hold some fixed, and fit. Nothing is stored.
 */
export function GlobalFit({ manuscriptId, datasets, models, mayRun }: Props) {
  const [kind, setKind] = useState(() => firstKind(datasets));
  const matching = datasets.filter((d) => d.kind === kind).sort((a, b) => a.name.localeCompare(b.name, undefined, { numeric: true }));
  const [modelId, setModelId] = useState(() => (orderModels(models, kind).suggested[0] ?? models[0]).id);
  const [ticked, setTicked] = useState<Set<string>>(() => new Set(matching.slice(0, 3).map((d) => d.id)));
  const [cols, setCols] = useState(() => defaultColumns(matching[0]?.columns ?? []));
  const [choices, setChoices] = useState<Record<string, ParamChoice>>(() => sharedByDefault(modelId));
  const [result, setResult] = useState<GlobalFitResult | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const model = models.find((m) => m.id === modelId)!;
  const chosen = matching.filter((d) => ticked.has(d.id));
  const unitOf = (name: string) => matching[0]?.columns.find((c) => c.name === name)?.unit ?? null;

  function pickKind(k: string) {
    setKind(k);
    const now = datasets.filter((d) => d.kind === k).sort((a, b) => a.name.localeCompare(b.name, undefined, { numeric: true }));
    setTicked(new Set(now.slice(0, 3).map((d) => d.id)));
    setCols(defaultColumns(now[0]?.columns ?? []));
    const suggested = orderModels(models, k).suggested[0];
    if (suggested && !model.kinds.includes(k)) pickModel(suggested.id);
    setResult(null);
  }

  function pickModel(id: string) {
    setModelId(id);
    setChoices(sharedByDefault(id));
    setResult(null);
  }

  function toggle(id: string, on: boolean) {
    setTicked((s) => {
      const n = new Set(s);
      if (on) n.add(id);
      else n.delete(id);
      return n;
    });
  }

  async function fit() {
    setError(null);
    const fixed: Record<string, number> = {};
    for (const p of model.parameters) {
      const text = choices[p.name]?.fixed.trim() ?? "";
      if (!text) continue;
      const value = Number(text);
      if (!Number.isFinite(value)) {
        setError(`Hold ${p.name} fixed at: “${text}” is not a number.`);
        return;
      }
      fixed[p.name] = value;
    }
    const shared = model.parameters.filter((p) => choices[p.name]?.shared).map((p) => p.name);
    const both = shared.find((name) => name in fixed);
    if (both) {
      setError(`${both} is both shared and held fixed: choose one.`);
      return;
    }
    const body = {
      manuscriptId,
      versionIds: chosen.map((d) => d.versionId),
      model: modelId,
      shared,
      options: { x: cols.x, y: cols.y, ...(cols.sigma ? { sigma: cols.sigma } : {}), ...(Object.keys(fixed).length ? { fixed } : {}) },
    };
    setBusy(true);
    try {
      setResult(await sendJson<GlobalFitResult>("/api/analyses/global", "POST", body));
    } catch (err) {
      setError(err instanceof ApiError ? err.message : (err as Error).message);
      setResult(null);
    } finally {
      setBusy(false);
    }
  }

  const kinds = [...new Set(datasets.map((d) => d.kind))].sort();
  return (
    <div className="space-y-4">
      <p className="text-sm text-muted">
        Fit several curves at once: a ticked parameter takes one value for all of them (the offset and amplitude of echoes of one centre at several pulse
        numbers, say); the others are fitted per curve. One covariance covers all, so the shared values carry the information of every curve. Nothing is stored.
      </p>
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
        <ModelSelect models={models} kind={kind} value={modelId} onChange={pickModel} label="Model for the global fit" />
        <div className="space-y-4">
          <Field label="Measurement kind for the global fit">
            <Select value={kind} onChange={(e) => pickKind(e.target.value)}>
              {kinds.map((k) => (
                <option key={k} value={k}>
                  {kindWords(k)} ({datasets.filter((d) => d.kind === k).length})
                </option>
              ))}
            </Select>
          </Field>
          <ColumnSelects columns={matching[0]?.columns ?? []} value={cols} onChange={setCols} />
        </div>
      </div>
      <DatasetChecklist
        legend={`Datasets to fit together (${chosen.length} of ${matching.length} ticked)`}
        kind={kind}
        datasets={matching}
        ticked={(id) => ticked.has(id)}
        onToggle={toggle}
      />
      <fieldset className="rounded-sm border border-rule">
        <legend className="ml-3 px-1 text-sm font-semibold">Parameters: shared by all, or held fixed</legend>
        <ul className="divide-y divide-rule/70 px-3 text-sm">
          {model.parameters.map((p) => {
            const unit = resolveUnit(p.unit, unitOf(cols.x), unitOf(cols.y));
            const choice = choices[p.name] ?? { shared: false, fixed: "" };
            const set = (next: Partial<ParamChoice>) => setChoices((all) => ({ ...all, [p.name]: { ...choice, ...next } }));
            return (
              <li key={p.name} className="flex flex-wrap items-center gap-x-6 gap-y-1 py-2">
                <span className="min-w-48 flex-1">
                  <span className="font-mono font-medium">{p.name}</span>
                  {unit ? <span className="text-muted"> in {unit}</span> : null}
                  <span className="block text-xs text-muted">{p.description}</span>
                </span>
                <label className="flex items-center gap-2">
                  <input type="checkbox" checked={choice.shared} onChange={(e) => set({ shared: e.target.checked })} />
                  Share {p.name}
                </label>
                <label className="flex items-center gap-2">
                  Hold {p.name} fixed at
                  <span className="w-28">
                    <TextInput inputMode="decimal" value={choice.fixed} placeholder="fitted" onChange={(e) => set({ fixed: e.target.value })} />
                  </span>
                </label>
              </li>
            );
          })}
        </ul>
      </fieldset>
      {mayRun ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button type="button" onClick={() => void fit()} disabled={busy || chosen.length < 2 || !cols.x || !cols.y}>
            {busy ? "Fitting…" : `Fit ${chosen.length} datasets together`}
          </Button>
          <span className="text-xs text-muted">{chosen.length < 2 ? "Tick at least two datasets." : "Automatic start values and default bounds."}</span>
        </div>
      ) : (
        <p className="text-sm text-muted">
          <span aria-hidden>○ </span>Only the PI and authors run analyses.
        </p>
      )}
      {error ? <Notice ok={false}>{error}</Notice> : null}
      {result ? <GlobalFitResultView result={result} model={model} xName={cols.x} yName={cols.y} /> : null}
    </div>
  );
}

function sharedByDefault(modelId: string): Record<string, ParamChoice> {
  return Object.fromEntries((USUALLY_SHARED[modelId] ?? []).map((name) => [name, { shared: true, fixed: "" }]));
}
