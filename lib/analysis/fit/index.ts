export { fitCurve, type CurveFitResult } from "./fit-curve";
export { minimizeLeastSquares, type LeastSquaresProblem } from "./levenberg-marquardt";
