import "server-only";
import { FitInputError, getModel } from "@/lib/analysis";
import { compareModels } from "@/lib/analysis/model-comparison";
import { resolveUnit } from "@/lib/analysis/param-unit";
import type { UnitRole } from "@/lib/analysis/models/types";
import { authorize, type SessionUser } from "@/lib/authz";
import { badRequest } from "@/lib/errors";
import { manuscriptOfVersion } from "../datasets/scope";
import { loadFitData } from "./fit-data";
import { curveFor } from "./run-analysis";
import { comparisonInput, type ComparisonInput } from "./schemas";

const nullIfNaN = (v: number) => (Number.isFinite(v) ? v : null);

/**
 * Fits two to four candidate models (or one model with parameters held) to the same columns of one
 * version and ranks them (lib/analysis/model-comparison): χ²ᵣ, AIC with Akaike weights, BIC,
 * F-tests for nested pairs, residuals for side-by-side strips, and the preferred one with the
 * reason. Nothing is stored.
 */
export async function compareCandidates(user: SessionUser, raw: ComparisonInput) {
  const input = comparisonInput.parse(raw);
  await authorize(user, "analysis.run", await manuscriptOfVersion(input.versionId));
  input.candidates.forEach((c, i) => {
    if (!getModel(c.model)) throw badRequest(`candidates[${i}].model: unknown model "${c.model}"; GET /api/analysis-models lists them.`);
  });
  const data = await loadFitData(input.versionId, input.options);
  let comparison;
  try {
    comparison = compareModels(input.candidates, { x: data.x, y: data.y, sigma: data.sigma, xUnit: data.xUnit });
  } catch (err) {
    if (err instanceof FitInputError) throw badRequest(`candidates: ${err.message}.`);
    throw err;
  }
  const unit = (u: UnitRole) => resolveUnit(u, data.xUnit, data.yUnit);
  return {
    versionId: input.versionId,
    inputSha256: data.version.sha256,
    options: input.options,
    units: { x: data.xUnit, y: data.yUnit },
    points: data.x.length,
    weighted: Boolean(data.sigma),
    preferred: comparison.preferred,
    reason: comparison.reason,
    candidates: comparison.candidates.map((c, i) => ({
      label: c.label,
      model: c.modelId,
      modelVersion: c.fit.modelVersion,
      fixed: input.candidates[i].fixed ?? {},
      k: c.k,
      chi2: nullIfNaN(c.fit.chi2),
      dof: c.fit.dof,
      chi2red: nullIfNaN(c.fit.chi2red),
      aic: nullIfNaN(c.fit.aic),
      bic: nullIfNaN(c.fit.bic),
      deltaAic: nullIfNaN(c.deltaAic),
      deltaBic: nullIfNaN(c.deltaBic),
      akaikeWeight: nullIfNaN(c.akaikeWeight),
      eligible: c.eligible,
      converged: c.fit.converged,
      reason: c.fit.reason,
      quality: c.fit.quality,
      warnings: c.fit.warnings,
      parameters: c.fit.params.map((p) => ({
        name: p.name,
        value: nullIfNaN(p.value),
        stderr: nullIfNaN(p.stderr),
        unit: unit(p.unit),
        fixed: p.fixed,
        atBound: p.atBound,
      })),
      residuals: c.fit.residuals.map(nullIfNaN),
      curve: curveFor(c.modelId, c.fit, data.x),
    })),
    tests: comparison.tests,
    data: { x: Array.from(data.x), y: Array.from(data.y), sigma: data.sigma ? Array.from(data.sigma, nullIfNaN) : null },
  };
}
