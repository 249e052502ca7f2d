/** Small synthetic NV measurements for render tests and the render benchmark (fixed, no randomness). */
import { FIGURE_TEMPLATES } from "@/lib/figures/templates";

const tau = Array.from({ length: 40 }, (_, i) => 2 + i * 5); // µs
const model = (t: number) => 0.5 + 0.4 * Math.exp(-((t / 80) ** 1.5));
const wiggle = (t: number) => 0.01 * Math.sin(t * 7);

export const echo = tau.map((t) => ({ tau: t, signal: model(t) + wiggle(t), sigma: 0.01 }));
export const fit = [...tau.map((t) => ({ series: "curve", tau: t, signal: model(t) })), ...tau.map((t) => ({ series: "residual", tau: t, signal: wiggle(t) }))];
export const spectrum = Array.from({ length: 400 }, (_, i) => {
  const w = 550 + i * 0.5; // nm
  const g = (c: number, s: number, a: number) => a * Math.exp(-(((w - c) / s) ** 2));
  return { wavelength: w, intensity: 10 + g(637.4, 1, 50) + g(575.1, 1.5, 20) + g(690, 30, 30) };
});
export const plmap: object[] = [];
for (let i = 0; i < 30; i++) {
  for (let j = 0; j < 30; j++) plmap.push({ x: i * 0.2, y: j * 0.2, counts: 20 + 200 * Math.exp(-(((i - 12) ** 2 + (j - 18) ** 2) / 4)) });
}
export const population = ["A", "B", "C"].flatMap((g, k) =>
  Array.from({ length: 8 + k * 3 }, (_, i) => ({ sample: g, T2: 50 + k * 30 + ((i * 37) % 17) * 3 })),
);
export const nmr = Array.from({ length: 400 }, (_, i) => {
  const f = 1.5 + i * 0.002; // MHz
  return { frequency: f, contrast: 1 - 0.05 * Math.exp(-(((f - 2.129) / 0.02) ** 2)) };
});

/** Rows for every data name the templates use with their defaults (fit and residuals share a table). */
export const TEMPLATE_DATA: Record<string, object[]> = {
  echo,
  fit,
  residuals: fit,
  spectrum,
  plmap,
  population,
  nmr,
  data: echo.map((r) => ({ x: r.tau, y: r.signal, sigma: r.sigma })),
  // T₂ at N = 1 … 16 π pulses, growing as N^(2/3) (invented), with 3 % errors.
  scaling: [1, 2, 4, 8, 16].map((n) => ({ N: n, T2: 120 * n ** (2 / 3), T2_err: 3.6 * n ** (2 / 3) })),
};

export const templateSpec = (id: string, options: Record<string, unknown> = {}) => FIGURE_TEMPLATES.find((t) => t.id === id)!.build(options);

/** A scatter panel of n points (x in µs, y normalised). */
export function scatterSpec(name = "trace") {
  return {
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    data: { name },
    mark: { type: "point", filled: true, size: 4 },
    encoding: {
      x: { field: "t", type: "quantitative", title: "t (µs)" },
      y: { field: "s", type: "quantitative", title: "signal", scale: { zero: false } },
    },
    config: { font: "Inter", axis: { labelFontSize: 7, titleFontSize: 8 } },
  };
}

export function scatterRows(n: number): Array<{ t: number; s: number }> {
  return Array.from({ length: n }, (_, i) => ({ t: i * 0.01, s: 1 + 0.1 * Math.sin(i / 50) + 0.01 * Math.cos(i * 1.7) }));
}
