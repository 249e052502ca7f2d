/** Samples a model curve for drawing, on a linear or logarithmic x grid (x in data units). */
import { FitInputError } from "./fit-input-error";
import { getModelOrThrow } from "./model-lookup";
import type { FitModel } from "./models/types";

export interface SampledCurve {
  x: number[];
  y: number[];
}

export function sampleCurve(
  modelId: string | FitModel,
  params: Record<string, number> | ArrayLike<number>,
  xMin: number,
  xMax: number,
  n: number,
  logSpaced = false,
): SampledCurve {
  const model = getModelOrThrow(modelId);
  const values = model.params.map((param, j) => {
    const value = isRecord(params) ? params[param.name] : params[j];
    if (typeof value !== "number" || !Number.isFinite(value)) {
      throw new FitInputError(`missing or non-finite value for parameter "${param.name}"`, "params");
    }
    return value;
  });
  if (!Number.isFinite(xMin) || !Number.isFinite(xMax) || !(xMin < xMax)) {
    throw new FitInputError("xMin must be finite and below xMax", "xMin");
  }
  if (!Number.isInteger(n) || n < 2) throw new FitInputError("n must be an integer ≥ 2", "n");
  if (logSpaced && !(xMin > 0)) throw new FitInputError("a log-spaced curve needs xMin > 0", "xMin");
  const x = new Array<number>(n);
  const y = new Array<number>(n);
  const logMin = Math.log(xMin);
  const logStep = (Math.log(xMax) - logMin) / (n - 1);
  const step = (xMax - xMin) / (n - 1);
  for (let i = 0; i < n; i++) {
    x[i] = logSpaced ? Math.exp(logMin + i * logStep) : xMin + i * step;
    y[i] = model.evaluate(x[i], values);
  }
  x[n - 1] = xMax;
  y[n - 1] = model.evaluate(xMax, values);
  return { x, y };
}

function isRecord(params: Record<string, number> | ArrayLike<number>): params is Record<string, number> {
  return typeof (params as ArrayLike<number>).length !== "number";
}
