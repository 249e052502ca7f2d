/** Public entry point of the pure analysis core: models, fitting and curve sampling. */
export { fitModel, type ModelFitResult } from "./fit-model";
export { FitInputError } from "./fit-input-error";
export { getModel, listModels } from "./model-lookup";
export { sampleCurve, type SampledCurve } from "./sample-curve";
export type { FitModel } from "./models/types";
