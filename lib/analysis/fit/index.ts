export { fitCurve, type CurveFitOptions, type CurveFitResult } from "./fit-curve";
export type { CurveData, CurveFunction } from "./curve-problem";
export {
  DEFAULT_SOLVER_OPTIONS,
  minimizeLeastSquares,
  type LeastSquaresProblem,
  type SolverOptions,
  type SolverOutcome,
} from "./levenberg-marquardt";
export { computeCovariance } from "./covariance";
