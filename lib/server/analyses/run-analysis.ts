import "server-only";
import { and, desc, eq, isNotNull, isNull, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, datasets, versions } from "@/db/schema";
import { getModel, sampleCurve, type ModelFitResult } from "@/lib/analysis";
import type { BootstrapInterval, BootstrapSummary } from "@/lib/analysis/bootstrap";
import { authorize, type SessionUser } from "@/lib/authz";
import { appendAudit } from "../audit";
import { newId } from "../crypto";
import { badRequest, notFound } from "@/lib/errors";
import { manuscriptOfVersion } from "../datasets/scope";
import { importDatasetFromBytes } from "../datasets/upload-dataset";
import { derivedCsv } from "./derived-file";
import { runFitJob } from "./fit-job";
import { fitInPool } from "./fit-pool";
import { loadFitData, type FitData } from "./fit-data";
import { analysisInput, type AnalysisInput } from "./schemas";
import { resolveUnit } from "@/lib/analysis/param-unit";

const CURVE_POINTS = 400;
const nullIfNaN = (v: number) => (Number.isFinite(v) ? v : null);

/** Runs the model on the selected columns with the options' start values, fixed parameters, bounds and iteration cap. */
export function fitOrExplain(
  input: Pick<AnalysisInput, "model" | "options">,
  data: Pick<FitData, "x" | "y" | "sigma"> & { xUnit?: string | null },
): ModelFitResult {
  const outcome = runFitJob({ model: input.model, options: input.options, x: data.x, y: data.y, sigma: data.sigma, xUnit: data.xUnit });
  if (!outcome.ok) throw badRequest(outcome.message);
  return outcome.fit;
}

/** How a run gets its fit: in this thread (one fit) or on the fit pool (batches, and a bootstrap's thousand refits). */
type Fitter = (input: AnalysisInput, data: FitData) => ModelFitResult | Promise<ModelFitResult>;

const fitOnPool: Fitter = (input, data) =>
  fitInPool({ model: input.model, options: input.options, x: data.x, y: data.y, sigma: data.sigma, xUnit: data.xUnit });

/** The fitted curve on the grid a stored run samples it on (log-spaced when x spans more than two decades). */
export function curveFor(modelId: string, fit: Pick<ModelFitResult, "values">, x: ArrayLike<number>) {
  let lo = Infinity,
    hi = -Infinity;
  for (let i = 0; i < x.length; i++) {
    if (x[i] < lo) lo = x[i];
    if (x[i] > hi) hi = x[i];
  }
  const log = lo > 0 && hi / lo > 100;
  return sampleCurve(modelId, fit.values, lo, hi, CURVE_POINTS, log);
}

/** Runs a model on a version's columns; nothing is stored (for adjusting before saving). */
export async function previewAnalysis(user: SessionUser, raw: AnalysisInput) {
  const input = analysisInput.parse(raw);
  await authorize(user, "analysis.run", await manuscriptOfVersion(input.versionId));
  const data = await loadFitData(input.versionId, input.options);
  const fit = fitOrExplain(input, data);
  return describeRun(input, data, fit, curveFor(input.model, fit, data.x));
}

/** Bootstrap intervals with NaN as null, units resolved like the parameters'. */
function describeBootstrap(summary: BootstrapSummary, units: (name: string) => string) {
  const interval = (b: BootstrapInterval) => ({
    name: b.name,
    value: nullIfNaN(b.value),
    stderr: nullIfNaN(b.stderr),
    unit: units(b.name),
    interval68: b.interval68.map(nullIfNaN),
    interval95: b.interval95.map(nullIfNaN),
    ratio: nullIfNaN(b.ratio),
    disagrees: b.disagrees,
  });
  return { ...summary, parameters: summary.parameters.map(interval), derived: summary.derived.map(interval) };
}

export function describeRun(input: AnalysisInput, data: FitData, fit: ModelFitResult, curve: { x: number[]; y: number[] }) {
  const parameters = fit.params.map((p) => ({
    name: p.name,
    value: nullIfNaN(p.value),
    stderr: nullIfNaN(p.stderr),
    unit: resolveUnit(p.unit, data.xUnit, data.yUnit),
    fixed: p.fixed,
    atBound: p.atBound,
    start: nullIfNaN(p.start),
    bounds: p.bounds.map(nullIfNaN),
  }));
  return {
    model: input.model,
    modelVersion: fit.modelVersion,
    versionId: input.versionId,
    inputSha256: data.version.sha256,
    options: input.options,
    parameters,
    // Quantities computed from the parameters (t_π …), their errors propagated through the covariance.
    derived: fit.derived.map((d) => ({
      name: d.name,
      value: nullIfNaN(d.value),
      stderr: nullIfNaN(d.stderr),
      unit: resolveUnit(d.unit, data.xUnit, data.yUnit),
      description: d.description,
      formula: d.formula,
    })),
    verdicts: fit.verdicts,
    // Percentile intervals from a residual bootstrap, when the options asked for one.
    bootstrap: fit.bootstrap
      ? describeBootstrap(fit.bootstrap, (name) => {
          const unit = fit.params.find((p) => p.name === name)?.unit ?? fit.derived.find((d) => d.name === name)?.unit ?? "1";
          return resolveUnit(unit, data.xUnit, data.yUnit);
        })
      : null,
    chi2: nullIfNaN(fit.chi2),
    chi2red: nullIfNaN(fit.chi2red),
    dof: fit.dof,
    r2: nullIfNaN(fit.r2),
    aic: nullIfNaN(fit.aic),
    bic: nullIfNaN(fit.bic),
    converged: fit.converged,
    reason: fit.reason,
    // Whether the fit describes the data (residual structure, χ²ᵣ, bounds, physical ranges, shape), in one level and words.
    quality: fit.quality,
    iterations: fit.iterations,
    warnings: [...fit.warnings, ...(data.dropped ? [`${data.dropped} rows left out (missing values or outside the x range)`] : [])],
    covariance: fit.covariance.map((r) => r.map(nullIfNaN)),
    correlation: fit.correlation.map((r) => r.map(nullIfNaN)),
    points: data.x.length,
    units: { x: data.xUnit, y: data.yUnit },
    // σ per point (the options' sigma column, same units as y) for the plot's error bars; null when unweighted.
    data: {
      x: Array.from(data.x),
      y: Array.from(data.y),
      sigma: data.sigma ? Array.from(data.sigma, nullIfNaN) : null,
      residuals: fit.residuals.map(nullIfNaN),
      // With a fit window: the points outside it, drawn faded (not stored with the run; the window is, in options).
      ...(data.outside ? { outside: data.outside } : {}),
    },
    curve,
  };
}

/** Finds (or creates) the dataset that holds the derived versions of one source dataset and model. */
async function derivedDatasetId(manuscriptId: string, source: FitData["dataset"], modelId: string): Promise<string | undefined> {
  const [d] = await getDb()
    .select({ id: datasets.id })
    .from(datasets)
    .where(
      and(
        eq(datasets.manuscriptId, manuscriptId),
        sql`json_extract(${datasets.tags}, '$.derivedFrom') = ${source.id}`,
        sql`json_extract(${datasets.tags}, '$.model') = ${modelId}`,
      ),
    );
  return d?.id;
}

/**
 * Runs and stores: the run records the input hash, model id and code version, options and the
 * full result, and writes a derived version (curve, data, residuals) that figures can bind to.
 */
export async function runAnalysis(user: SessionUser, raw: AnalysisInput, fitter?: Fitter) {
  const input = analysisInput.parse(raw);
  const manuscriptId = await manuscriptOfVersion(input.versionId);
  await authorize(user, "analysis.run", manuscriptId);
  const data = await loadFitData(input.versionId, input.options);
  const fit = await (fitter ?? (input.options.bootstrap ? fitOnPool : fitOrExplain))(input, data);
  const run = describeRun(input, data, fit, curveFor(input.model, fit, data.x));
  const id = newId();
  const csv = derivedCsv({
    sourceVersionId: input.versionId,
    sourceSha256: data.version.sha256,
    modelId: input.model,
    modelVersion: fit.modelVersion,
    xName: input.options.x,
    xUnit: data.xUnit,
    yName: input.options.y,
    yUnit: data.yUnit,
    sigmaColumn: input.options.sigma ?? null,
    ...(input.options.xRange ? { xRange: input.options.xRange } : {}),
    parameters: run.parameters.map((p) => ({ name: p.name, value: p.value ?? NaN, stderr: p.stderr ?? NaN, unit: p.unit, fixed: p.fixed })),
    derived: run.derived.map((q) => ({ name: q.name, value: q.value ?? NaN, stderr: q.stderr ?? NaN, unit: q.unit, formula: q.formula })),
    bootstrap: run.bootstrap
      ? { draws: run.bootstrap.draws, seed: run.bootstrap.seed, used: run.bootstrap.used, intervals: [...run.bootstrap.parameters, ...run.bootstrap.derived] }
      : null,
    chi2red: fit.chi2red,
    dof: fit.dof,
    curve: run.curve,
    dataX: data.x,
    dataY: data.y,
    residuals: fit.residuals,
  });
  const existing = await derivedDatasetId(manuscriptId, data.dataset, input.model);
  const { data: _points, curve: _curve, ...stored } = run;
  // The run is recorded in the transaction that records its derived version: a crash leaves both or neither.
  const derived = await importDatasetFromBytes(
    user,
    manuscriptId,
    `fit-${input.model}-${data.version.fileName.replace(/\.[^.]+$/, "")}.csv`,
    new TextEncoder().encode(csv),
    {
      ...(existing
        ? { datasetId: existing }
        : {
            name: `${data.dataset.name} — fit: ${getModel(input.model)!.title}`,
            metadata: JSON.stringify({
              kind: data.dataset.kind,
              sample: data.dataset.sample,
              tags: { ...data.dataset.tags, derivedFrom: data.dataset.id, model: input.model },
            }),
          }),
    },
    async (tx, version) => {
      await tx.insert(analyses).values({
        id,
        manuscriptId,
        versionId: input.versionId,
        inputSha256: data.version.sha256,
        model: input.model,
        modelVersion: fit.modelVersion,
        options: input.options,
        result: { ...stored, residuals: run.data.residuals },
        derivedVersionId: version.id,
        createdBy: user.id,
      });
      await tx
        .update(versions)
        .set({ derivedFromAnalysisId: id })
        .where(and(eq(versions.id, version.id), isNull(versions.derivedFromAnalysisId)));
      await appendAudit(tx, {
        actorId: user.id,
        manuscriptId,
        action: "analysis.run",
        target: `analysis:${id}`,
        data: { versionId: input.versionId, model: input.model, modelVersion: fit.modelVersion, derivedVersionId: version.id },
      });
    },
  );
  return { id, ...run, derivedVersionId: derived.id };
}

async function manuscriptOfAnalysis(analysisId: string): Promise<string> {
  const [a] = await getDb().select({ m: analyses.manuscriptId }).from(analyses).where(eq(analyses.id, analysisId));
  if (!a) throw notFound();
  return a.m;
}

export async function getAnalysis(user: SessionUser, analysisId: string) {
  await authorize(user, "manuscript.read", await manuscriptOfAnalysis(analysisId));
  const [a] = await getDb().select().from(analyses).where(eq(analyses.id, analysisId));
  return a;
}

export { manuscriptOfAnalysis };

/** Stored runs on a version for lists and pickers: archived ones left out, or only those when `archived`. */
export async function listAnalysesForVersion(user: SessionUser, versionId: string, archived = false) {
  await authorize(user, "manuscript.read", await manuscriptOfVersion(versionId));
  return getDb()
    .select()
    .from(analyses)
    .where(and(eq(analyses.versionId, versionId), archived ? isNotNull(analyses.archivedAt) : isNull(analyses.archivedAt)))
    .orderBy(desc(analyses.createdAt));
}
