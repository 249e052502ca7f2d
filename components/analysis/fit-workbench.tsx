"use client";
import Link from "next/link";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { ApiError, fetchJson, postForEvents, sendJson } from "@/components/api-client";
import { Button, Notice, Sheet } from "@/components/ui";
import { resolveUnit } from "@/lib/analysis/param-unit";
import { returnWithRun } from "@/lib/figures/return-to";
import type { BootstrapEvent, FitOptions, FitResult, ModelInfo, SavedRun, StoredRun } from "./api";
import { BatchProgress } from "./batch-progress";
import { BOOTSTRAP_OFF, BootstrapFields, type BootstrapDraft } from "./bootstrap-fields";
import { buildOptions, defaultColumns, defaultsFrom, orderModels, type Column, type DefaultBounds, type ParamDraft } from "./fit-options";
import { FitWindowFields, NO_WINDOW, windowDraft, type WindowDraft } from "./fit-window";
import { ColumnSelects, ModelSelect } from "./model-and-columns";
import { ModelComparison } from "./model-comparison";
import { ParameterInputs } from "./parameter-inputs";
import { ShownFit, type Shown } from "./shown-fit";
import { StoredRuns } from "./stored-runs";
import { comparisonColumns, withBootstrap, withWindow } from "./workbench-options";

interface Props {
  versionId: string;
  kind: string;
  columns: Column[];
  models: ModelInfo[];
  mayRun: boolean;
  initialRuns: StoredRun[];
  /** The panel builder that sent the user here (a checked path); after saving, a link leads back with the new run. */
  returnTo?: string | null;
}

/** Choose a model and columns, adjust the parameters, fit (nothing stored), then save the run with its derived version. */
export function FitWorkbench({ versionId, kind, columns, models, mayRun, initialRuns, returnTo }: Props) {
  const queryClient = useQueryClient();
  const runsKey = ["version-analyses", versionId];
  const runs = useQuery({
    queryKey: runsKey,
    initialData: { items: initialRuns },
    queryFn: () => fetchJson<{ items: StoredRun[] }>(`/api/versions/${versionId}/analyses`),
  });
  const [modelId, setModelId] = useState(() => (orderModels(models, kind).suggested[0] ?? models[0])?.id ?? "");
  const [cols, setCols] = useState(() => defaultColumns(columns));
  const [drafts, setDrafts] = useState<Record<string, ParamDraft>>({});
  const [fitWindow, setFitWindow] = useState<WindowDraft>(NO_WINDOW);
  const [bootstrapDraft, setBootstrapDraft] = useState<BootstrapDraft>(BOOTSTRAP_OFF);
  const [draws, setDraws] = useState<{ done: number; total: number } | null>(null);
  const [stopDraws, setStopDraws] = useState<AbortController | null>(null);
  const [defaults, setDefaults] = useState<{ key: string; bounds: DefaultBounds } | null>(null);
  const [shown, setShown] = useState<Shown | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState<"fit" | "save" | null>(null);
  const [saved, setSaved] = useState<{ number: number; datasetId: string; id: string; analysisId: string } | null>(null);

  const model = models.find((m) => m.id === modelId);
  const unitOf = (name: string) => columns.find((c) => c.name === name)?.unit ?? null;
  const rows = (model?.parameters ?? []).map((p) => ({ name: p.name, description: p.description, unit: resolveUnit(p.unit, unitOf(cols.x), unitOf(cols.y)) }));
  const dataKey = `${modelId}|${cols.x}|${cols.y}`;
  const knownDefaults = defaults?.key === dataKey ? defaults.bounds : undefined;
  const built = useMemo(
    () => withBootstrap(withWindow(buildOptions(model?.parameters ?? [], drafts, cols, knownDefaults), fitWindow), bootstrapDraft),
    [model, drafts, cols, knownDefaults, fitWindow, bootstrapDraft],
  );
  const currentKey = "options" in built ? JSON.stringify({ modelId, options: built.options }) : null;
  const lastValues = shown?.run.model === modelId ? Object.fromEntries(shown.run.parameters.map((p) => [p.name, p.value])) : undefined;

  const preview = (options: FitOptions) => sendJson<FitResult>("/api/analyses/preview", "POST", { versionId, model: modelId, options });
  /** The fit with its bootstrap, the draws' progress shown as they stream in; null when stopped. */
  const previewWithBootstrap = async (options: FitOptions): Promise<FitResult | null> => {
    const stop = new AbortController();
    setStopDraws(stop);
    setDraws({ done: 0, total: options.bootstrap!.draws });
    let run: FitResult | null = null;
    try {
      await postForEvents<BootstrapEvent>(
        "/api/analyses/bootstrap",
        { versionId, model: modelId, options },
        (event) => {
          if (event.type === "progress") setDraws({ done: event.done, total: event.total });
          if (event.type === "done") run = event.run;
        },
        stop.signal,
      );
    } catch (err) {
      if (!stop.signal.aborted) throw err;
    } finally {
      setStopDraws(null);
      setDraws(null);
    }
    return run;
  };
  const learn = (run: FitResult, options: FitOptions, base: DefaultBounds | undefined): DefaultBounds => {
    const fresh = defaultsFrom(run.parameters.filter((p) => !options.bounds?.[p.name]));
    const merged = { ...base, ...fresh };
    setDefaults({ key: dataKey, bounds: merged });
    return merged;
  };

  async function fit() {
    setBusy("fit");
    setError(null);
    setSaved(null);
    try {
      let request = built;
      let base = knownDefaults;
      if ("needDefaults" in request) {
        const plain = Object.fromEntries(Object.entries(drafts).map(([k, d]) => [k, { ...d, lower: "", upper: "" }]));
        const probeOptions = withWindow(buildOptions(model?.parameters ?? [], plain, cols), fitWindow); // no bootstrap: only the default ranges are wanted
        if (!("options" in probeOptions)) throw new Error("error" in probeOptions ? probeOptions.error : "Could not read the form.");
        const probe = await preview(probeOptions.options);
        base = learn(probe, probeOptions.options, base);
        request = withBootstrap(withWindow(buildOptions(model?.parameters ?? [], drafts, cols, base), fitWindow), bootstrapDraft);
      }
      if ("error" in request) {
        setError(request.error);
        return;
      }
      if (!("options" in request)) return;
      const run = request.options.bootstrap ? await previewWithBootstrap(request.options) : await preview(request.options);
      if (!run) {
        setError("Bootstrap stopped: the fit is not shown. Fit again to start the draws anew.");
        return;
      }
      learn(run, request.options, base);
      setShown({ key: JSON.stringify({ modelId, options: request.options }), run, modelTitle: model?.title ?? modelId, xName: cols.x, yName: cols.y });
    } catch (err) {
      setError((err as Error).message);
    } finally {
      setBusy(null);
    }
  }

  async function save() {
    if (!shown) return;
    setBusy("save");
    setError(null);
    try {
      const run = await sendJson<SavedRun>("/api/analyses", "POST", { versionId, model: shown.run.model, options: shown.run.options });
      setShown({ ...shown, run });
      const derived = await fetchJson<{ number: number; datasetId: string }>(`/api/versions/${run.derivedVersionId}`);
      setSaved({ number: derived.number, datasetId: derived.datasetId, id: run.derivedVersionId, analysisId: run.id });
      await queryClient.invalidateQueries({ queryKey: runsKey });
    } catch (err) {
      setError(err instanceof ApiError ? err.message : (err as Error).message);
    } finally {
      setBusy(null);
    }
  }

  const pickModel = (id: string) => {
    setModelId(id);
    setDrafts({});
    setSaved(null);
  };
  const stale = shown !== null && shown.key !== currentKey;
  /** A window drawn on the plot or taken from a stored run becomes the typed window. */
  const useWindow = mayRun
    ? (range: readonly [number, number]) => {
        setFitWindow(windowDraft(range));
        setSaved(null);
      }
    : undefined;

  return (
    <div className="space-y-6">
      {returnTo && !saved ? (
        <p className="text-sm text-muted" data-testid="fit-for-panel">
          You came here from a panel: fit, then save the run to go back to the panel with it chosen.{" "}
          <Link href={returnTo} className="underline">
            Back to the panel without a fit
          </Link>
        </p>
      ) : null}
      {mayRun ? (
        <Sheet>
          <h2 className="sr-only">Fit settings</h2>
          <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_minmax(0,1.3fr)]">
            <ModelSelect models={models} kind={kind} value={modelId} onChange={pickModel} />
            <ColumnSelects
              columns={columns}
              value={cols}
              onChange={(v) => {
                setCols(v);
                setSaved(null);
              }}
            />
          </div>
          <h3 className="mb-1 mt-5 text-sm font-semibold">Parameters</h3>
          <p className="mb-2 text-xs text-muted">
            A blank start value lets the fit guess from the data; switch on “fixed” to hold a parameter at the value typed. A blank end of the allowed range is
            the model&apos;s default (shown once you have fitted).
          </p>
          <ParameterInputs
            rows={rows}
            drafts={drafts}
            defaults={knownDefaults}
            lastValues={lastValues}
            onChange={(name, d) => {
              setDrafts((all) => ({ ...all, [name]: d }));
              setSaved(null);
            }}
          />
          <FitWindowFields
            value={fitWindow}
            unit={unitOf(cols.x)}
            onChange={(v) => {
              setFitWindow(v);
              setSaved(null);
            }}
          />
          <BootstrapFields
            value={bootstrapDraft}
            onChange={(v) => {
              setBootstrapDraft(v);
              setSaved(null);
            }}
          />
          <div className="mt-4 flex flex-wrap items-center gap-3">
            <Button type="button" onClick={() => void fit()} disabled={busy !== null || !model}>
              {busy === "fit" ? "Fitting…" : "Fit"}
            </Button>
            {stopDraws ? (
              <Button type="button" variant="quiet" onClick={() => stopDraws.abort()}>
                Stop bootstrap
              </Button>
            ) : null}
            <Button type="button" variant="quiet" onClick={() => void save()} disabled={busy !== null || !shown || stale}>
              {busy === "save" ? "Saving…" : "Save run"}
            </Button>
            <span className="text-xs text-muted">
              {!shown
                ? "Fit first: nothing is stored until you save."
                : stale
                  ? "The settings changed since this fit; fit again before saving."
                  : "Save stores exactly the fit shown, with a derived version."}
            </span>
          </div>
          {draws ? (
            <div className="mt-3 max-w-xl">
              <BatchProgress done={draws.done} total={draws.total} failed={0} label="Bootstrap progress" noun="draws" />
            </div>
          ) : null}
          {error ? <Notice ok={false}>{error}</Notice> : null}
          {saved ? (
            <Notice ok>
              Saved —{" "}
              <Link href={`/datasets/${saved.datasetId}?v=${saved.id}`} className="underline">
                derived version {saved.number}
              </Link>{" "}
              (fitted curve, data and residuals, traceable to this version).
              {returnTo ? (
                <>
                  {" "}
                  <Link href={returnWithRun(returnTo, saved.analysisId)} className="font-semibold underline">
                    Back to the panel
                  </Link>{" "}
                  (the builder there uses this run).
                </>
              ) : null}
            </Notice>
          ) : null}
        </Sheet>
      ) : (
        <Sheet>
          <p className="text-sm text-muted">
            <span aria-hidden>○ </span>You can look at the stored fits on this version. Only the PI and authors run analyses.
          </p>
        </Sheet>
      )}
      {shown ? <ShownFit shown={shown} stale={stale} onWindow={useWindow} /> : null}
      {mayRun ? (
        <ModelComparison
          key={modelId}
          versionId={versionId}
          kind={kind}
          models={models}
          modelId={modelId}
          columns={comparisonColumns(cols, fitWindow)}
          units={{ x: unitOf(cols.x), y: unitOf(cols.y) }}
        />
      ) : null}
      <section aria-labelledby="stored-runs-heading">
        <h2 id="stored-runs-heading" className="mb-2 text-lg font-semibold">
          Stored runs on this version
        </h2>
        <StoredRuns runs={runs.data.items} models={models} versionId={versionId} mayArchive={mayRun} onUseWindow={useWindow} />
      </section>
    </div>
  );
}
