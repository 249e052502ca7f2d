import "server-only";
import { FitInputError, getModel } from "@/lib/analysis";
import { globalFit } from "@/lib/analysis/global-fit";
import { resolveUnit } from "@/lib/analysis/param-unit";
import { authorize, type SessionUser } from "@/lib/authz";
import { badRequest } from "@/lib/errors";
import { checkVersions } from "./batch";
import { loadFitData, type FitData } from "./fit-data";
import { curveFor } from "./run-analysis";
import { globalInput, type GlobalInput } from "./schemas";

const nullIfNaN = (v: number) => (Number.isFinite(v) ? v : null);

/**
 * Fits one model over several versions of a manuscript at once, the named parameters shared by
 * all (lib/analysis/global-fit). The columns must carry the same units in every version: a shared
 * T₂ cannot be fitted to one curve in µs and another in ns. Nothing is stored.
 */
export async function previewGlobalFit(user: SessionUser, raw: GlobalInput) {
  const input = globalInput.parse(raw);
  await authorize(user, "analysis.run", input.manuscriptId);
  const model = getModel(input.model);
  if (!model) throw badRequest(`model: unknown model "${input.model}"; GET /api/analysis-models lists them.`);
  await checkVersions(input.manuscriptId, input.versionIds);
  const loaded: FitData[] = [];
  for (const versionId of input.versionIds) loaded.push(await loadFitData(versionId, input.options));
  const label = (d: (typeof loaded)[number]) => `${d.dataset.name} (version ${d.version.number})`;
  for (const d of loaded.slice(1)) {
    for (const axis of ["x", "y"] as const) {
      const unit = (f: typeof d) => (axis === "x" ? f.xUnit : f.yUnit);
      if (unit(d) !== unit(loaded[0]))
        throw badRequest(
          `versionIds: the ${axis} column is in ${unit(loaded[0]) ?? "no unit"} in ${label(loaded[0])} but in ${unit(d) ?? "no unit"} in ${label(d)}; a global fit needs the same units throughout.`,
        );
    }
  }
  let fit;
  try {
    fit = globalFit(model, {
      datasets: loaded.map((d) => ({ label: label(d), x: d.x, y: d.y, sigma: d.sigma })),
      shared: input.shared,
      start: input.options.start,
      fixed: input.options.fixed,
      bounds: input.options.bounds,
      maxIterations: input.options.maxIterations,
    });
  } catch (err) {
    if (err instanceof FitInputError)
      throw badRequest(`${err.field === "datasets" ? "versionIds" : err.field === "shared" ? "shared" : `options.${err.field}`}: ${err.message}.`);
    throw err;
  }
  const { xUnit, yUnit } = loaded[0];
  const unitOf = (name: string) => resolveUnit(model.params.find((p) => p.name === name)!.unit, xUnit, yUnit);
  return {
    model: model.id,
    modelVersion: fit.modelVersion,
    shared: fit.shared,
    fixed: fit.fixed,
    options: input.options,
    units: { x: xUnit, y: yUnit },
    params: fit.params.map((p) => ({
      name: p.name,
      dataset: p.dataset,
      value: nullIfNaN(p.value),
      stderr: p.undetermined ? null : nullIfNaN(p.stderr),
      unit: unitOf(p.name),
      atBound: p.atBound,
      bounds: p.bounds.map(nullIfNaN),
    })),
    datasets: fit.datasets.map((d, k) => ({
      versionId: input.versionIds[k],
      datasetId: loaded[k].dataset.id,
      label: d.label,
      sha256: loaded[k].version.sha256,
      values: d.values,
      stderr: Object.fromEntries(Object.entries(d.stderr).map(([n, v]) => [n, nullIfNaN(v)])),
      points: d.points,
      chi2PerPoint: nullIfNaN(d.chi2PerPoint),
      data: {
        x: Array.from(loaded[k].x),
        y: Array.from(loaded[k].y),
        sigma: loaded[k].sigma ? Array.from(loaded[k].sigma) : null,
        residuals: d.residuals.map(nullIfNaN),
      },
      curve: curveFor(model.id, d, loaded[k].x),
    })),
    chi2: nullIfNaN(fit.chi2),
    dof: fit.dof,
    chi2red: nullIfNaN(fit.chi2red),
    aic: nullIfNaN(fit.aic),
    bic: nullIfNaN(fit.bic),
    converged: fit.converged,
    reason: fit.reason,
    iterations: fit.iterations,
    warnings: fit.warnings,
    correlation: fit.correlation.map((r) => r.map(nullIfNaN)),
  };
}
