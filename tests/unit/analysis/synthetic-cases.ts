/**
 * Realistic synthetic data sets for each model, in typical lab units (µs, MHz, nm): the true
 * parameters, the x grid and the noise level.
 */
import { linspace } from "./seeded-random";

export interface SyntheticCase {
  modelId: string;
  truth: Record<string, number>;
  x: number[];
  noise: number;
}

const logspace = (from: number, to: number, count: number): number[] => linspace(Math.log10(from), Math.log10(to), count).map((v) => 10 ** v);

export const SYNTHETIC_CASES: SyntheticCase[] = [
  { modelId: "hahn_echo", truth: { S0: 0.5, A: 0.3, T2: 80, n: 2 }, x: linspace(0, 300, 500), noise: 0.01 },
  { modelId: "relaxation", truth: { S0: 0.2, A: 0.5, T1: 1000 }, x: logspace(1, 10000, 120), noise: 0.01 },
  { modelId: "relaxation_stretched", truth: { S0: 0.2, A: 0.5, T1: 800, n: 0.6 }, x: logspace(1, 20000, 150), noise: 0.01 },
  { modelId: "ramsey", truth: { S0: 0.5, A: 0.2, T2star: 1.5, delta: 3, phi: 0.4 }, x: linspace(0, 3, 300), noise: 0.02 },
  {
    modelId: "ramsey_14n",
    truth: { S0: 0.5, A: 0.1, T2star: 2, delta: 4, Apar: 2.16, phi: -0.3 },
    x: linspace(0, 4, 400),
    noise: 0.02,
  },
  { modelId: "odmr_lorentzian_1", truth: { B: 1, f1: 2870, w1: 3, c1: 0.1 }, x: linspace(2850, 2890, 400), noise: 0.005 },
  {
    modelId: "odmr_lorentzian_2",
    truth: { B: 2e5, f1: 2855, w1: 4, c1: 0.08, f2: 2885, w2: 5, c2: 0.06 },
    x: linspace(2830, 2910, 600),
    noise: 1000,
  },
  {
    modelId: "odmr_lorentzian_3",
    truth: { B: 1, f1: 2800, w1: 6, c1: 0.05, f2: 2870, w2: 6, c2: 0.07, f3: 2940, w3: 6, c3: 0.04 },
    x: linspace(2750, 2990, 800),
    noise: 0.004,
  },
  {
    modelId: "odmr_14n_triplet",
    truth: { B: 1, f0: 2870.3, Apar: 2.16, w: 0.6, c: 0.05 },
    x: linspace(2860, 2880, 2000),
    noise: 0.005,
  },
  {
    modelId: "odmr_15n_doublet",
    truth: { B: 1, f0: 2731.2, Apar: 3.03, w: 0.8, c: 0.04 },
    x: linspace(2720, 2742, 800),
    noise: 0.004,
  },
  {
    modelId: "odmr_two_resonances",
    truth: { B: 1, fMinus: 2750, wMinus: 8, cMinus: 0.06, fPlus: 2990, wPlus: 9, cPlus: 0.05 },
    x: linspace(2700, 3050, 700),
    noise: 0.004,
  },
  {
    modelId: "odmr_14n_two_groups",
    truth: { B: 1, fMinus: 2752.4, fPlus: 2987.6, Apar: 2.14, w: 0.9, cMinus: 0.03, cPlus: 0.028 },
    x: linspace(2700, 3050, 2000),
    noise: 0.004,
  },
  {
    modelId: "odmr_15n_two_groups",
    truth: { B: 1, fMinus: 2752.4, fPlus: 2987.6, Apar: 3.03, w: 1.0, cMinus: 0.03, cPlus: 0.03 },
    x: linspace(2700, 3050, 2000),
    noise: 0.004,
  },
  { modelId: "exponential", truth: { y0: 3, A: 5, k: 0.4 }, x: linspace(0, 15, 200), noise: 0.05 },
  { modelId: "gaussian", truth: { y0: 100, A: 800, x0: 637.4, sigma: 1.2 }, x: linspace(620, 660, 400), noise: 10 },
  { modelId: "lorentzian", truth: { y0: 1, A: -0.1, x0: 2870, gamma: 2 }, x: linspace(2850, 2890, 300), noise: 0.005 },
  {
    modelId: "pseudo_voigt",
    truth: { y0: 50, A: 1000, x0: 637.4, fwhm: 3, eta: 0.4 },
    x: linspace(620, 660, 500),
    noise: 10,
  },
  {
    modelId: "voigt",
    truth: { y0: 50, area: 4000, x0: 637.4, sigma: 1.0, gamma: 0.8 },
    x: linspace(620, 660, 500),
    noise: 10,
  },
  { modelId: "line", truth: { c0: 2, c1: -0.5 }, x: linspace(-3, 12, 50), noise: 0.2 },
  { modelId: "polynomial_2", truth: { c0: 1, c1: 0.3, c2: -0.02 }, x: linspace(0, 30, 80), noise: 0.1 },
  {
    modelId: "polynomial_3",
    truth: { c0: 2870, c1: -0.07, c2: 2e-4, c3: -3e-7 },
    x: linspace(250, 350, 120),
    noise: 0.05,
  },
];
