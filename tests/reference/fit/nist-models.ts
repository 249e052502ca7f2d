/**
 * The NIST StRD nonlinear-regression model functions, keyed by dataset name, transcribed from
 * the "Model:" section of each file (NIST StRD, Nonlinear Regression, <dataset>.dat).
 * x is the predictor (x1 for Nelson, whose second predictor is x2).
 */
export type NistModel = (b: ArrayLike<number>, x: number, x2: number) => number;

const exponentialRise: NistModel = (b, x) => b[0] * (1 - Math.exp(-b[1] * x));
const chwirut: NistModel = (b, x) => Math.exp(-b[0] * x) / (b[1] + b[2] * x);
const gauss: NistModel = (b, x) =>
  b[0] * Math.exp(-b[1] * x) + b[2] * Math.exp(-((x - b[3]) ** 2) / b[4] ** 2) + b[5] * Math.exp(-((x - b[6]) ** 2) / b[7] ** 2);
const lanczos: NistModel = (b, x) => b[0] * Math.exp(-b[1] * x) + b[2] * Math.exp(-b[3] * x) + b[4] * Math.exp(-b[5] * x);
const cubicOverCubic: NistModel = (b, x) => (b[0] + b[1] * x + b[2] * x ** 2 + b[3] * x ** 3) / (1 + b[4] * x + b[5] * x ** 2 + b[6] * x ** 3);

export const NIST_MODELS: Record<string, NistModel> = {
  Misra1a: exponentialRise,
  Chwirut2: chwirut,
  Chwirut1: chwirut,
  Lanczos3: lanczos,
  Gauss1: gauss,
  Gauss2: gauss,
  DanWood: (b, x) => b[0] * x ** b[1],
  Misra1b: (b, x) => b[0] * (1 - (1 + (b[1] * x) / 2) ** -2),
  Kirby2: (b, x) => (b[0] + b[1] * x + b[2] * x ** 2) / (1 + b[3] * x + b[4] * x ** 2),
  Hahn1: cubicOverCubic,
  Nelson: (b, x1, x2) => b[0] - b[1] * x1 * Math.exp(-b[2] * x2),
  MGH17: (b, x) => b[0] + b[1] * Math.exp(-x * b[3]) + b[2] * Math.exp(-x * b[4]),
  Lanczos1: lanczos,
  Lanczos2: lanczos,
  Gauss3: gauss,
  Misra1c: (b, x) => b[0] * (1 - (1 + 2 * b[1] * x) ** -0.5),
  Misra1d: (b, x) => (b[0] * b[1] * x) / (1 + b[1] * x),
  Roszman1: (b, x) => b[0] - b[1] * x - Math.atan(b[2] / (x - b[3])) / Math.PI,
  ENSO: (b, x) => {
    const w = 2 * Math.PI * x;
    return (
      b[0] +
      b[1] * Math.cos(w / 12) +
      b[2] * Math.sin(w / 12) +
      b[4] * Math.cos(w / b[3]) +
      b[5] * Math.sin(w / b[3]) +
      b[7] * Math.cos(w / b[6]) +
      b[8] * Math.sin(w / b[6])
    );
  },
  MGH09: (b, x) => (b[0] * (x ** 2 + x * b[1])) / (x ** 2 + x * b[2] + b[3]),
  Thurber: cubicOverCubic,
  BoxBOD: exponentialRise,
  Rat42: (b, x) => b[0] / (1 + Math.exp(b[1] - b[2] * x)),
  MGH10: (b, x) => b[0] * Math.exp(b[1] / (x + b[2])),
  Eckerle4: (b, x) => (b[0] / b[1]) * Math.exp(-0.5 * ((x - b[2]) / b[1]) ** 2),
  Rat43: (b, x) => b[0] / (1 + Math.exp(b[1] - b[2] * x)) ** (1 / b[3]),
  Bennett5: (b, x) => b[0] * (b[1] + x) ** (-1 / b[2]),
};

/** Nelson's response is log(y) (NIST StRD, Nonlinear Regression, Nelson.dat: "log[y] = …"). */
export const NIST_LOG_RESPONSE = new Set(["Nelson"]);
