import "server-only";
import { FitInputError, fitModel, getModel, type ModelFitResult } from "@/lib/analysis";
import { bootstrapFit } from "@/lib/analysis/bootstrap";
import type { FitInput } from "@/lib/analysis/fit-model";
import type { FitOptions } from "./schemas";

/** One fit as the fit workers take it: the model, the fit options that shape it, and the points. */
export interface FitJob {
  model: string;
  options: Pick<FitOptions, "start" | "fixed" | "bounds" | "maxIterations" | "bootstrap">;
  x: Float64Array;
  y: Float64Array;
  sigma?: Float64Array;
  xUnit?: string | null;
}

/** A fit, or why the request cannot be fitted (a 400 message naming the field). */
export type FitJobOutcome = { ok: true; fit: ModelFitResult } | { ok: false; message: string };

/** The fitter's input for a job. */
export function fitInputOf(job: FitJob): FitInput {
  return {
    x: job.x,
    y: job.y,
    sigma: job.sigma,
    xUnit: job.xUnit,
    start: job.options.start,
    fixed: job.options.fixed,
    bounds: job.options.bounds,
    maxIterations: job.options.maxIterations,
  };
}

/** Runs one fit (and its bootstrap when the options ask); input the fitter refuses comes back as a message, anything else is thrown. */
export function runFitJob(job: FitJob): FitJobOutcome {
  const model = getModel(job.model);
  if (!model) return { ok: false, message: `model: unknown model "${job.model}"; GET /api/analysis-models lists them.` };
  try {
    const input = fitInputOf(job);
    const fit = fitModel(model, input);
    if (job.options.bootstrap) fit.bootstrap = bootstrapFit(model, input, fit, job.options.bootstrap);
    return { ok: true, fit };
  } catch (err) {
    if (err instanceof FitInputError) return { ok: false, message: `options.${err.field}: ${err.message}.` };
    throw err;
  }
}
