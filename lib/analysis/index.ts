/** Public entry point of the pure analysis core: models, fitting and curve sampling. */
export { fitModel, type FitInput, type FittedParam, type ModelFitResult } from "./fit-model";
export { FitInputError } from "./fit-input-error";
export { getModel, getModelOrThrow, listModels } from "./model-lookup";
export { sampleCurve, type SampledCurve } from "./sample-curve";
export { fitCurve, type CurveFitOptions, type CurveFitResult, type CurveFunction } from "./fit";
export type { FitModel, MeasurementKind, ModelParam, UnitRole } from "./models/types";
export { faddeeva } from "./special/faddeeva";
export { voigtProfile } from "./special/voigt-profile";
