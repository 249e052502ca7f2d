/**
 * Residual-resampling bootstrap: its intervals against a closed form, its determinism, and the
 * warning when it disagrees with the covariance.
 */
import { describe, expect, it } from "vitest";
import { fitModel, getModel } from "@/lib/analysis";
import { bootstrapDraws, bootstrapFit, summariseBootstrap } from "@/lib/analysis/bootstrap";
import { linspace, seededRandom, synthesize } from "./seeded-random";

const line = getModel("line")!;
const x = linspace(0, 10, 60);
const y = synthesize((xi, p) => p[0] + p[1] * xi, [2, 0.5], x, 0.3, seededRandom(7));

/**
 * Standard error of an ordinary least-squares slope in closed form: s/√Sxx with s² = Σr²/(m − 2)
 * (any regression text, e.g. Draper & Smith, "Applied Regression Analysis", 3rd ed., §1.4), computed
 * here without the fitter.
 */
function olsSlopeError(xs: number[], ys: number[]): { slope: number; stderr: number } {
  const m = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / m;
  const my = ys.reduce((a, b) => a + b, 0) / m;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < m; i++) {
    sxx += (xs[i] - mx) ** 2;
    sxy += (xs[i] - mx) * (ys[i] - my);
  }
  const slope = sxy / sxx;
  let ss = 0;
  for (let i = 0; i < m; i++) ss += (ys[i] - my - slope * (xs[i] - mx)) ** 2;
  return { slope, stderr: Math.sqrt(ss / (m - 2) / sxx) };
}

describe("residual bootstrap", () => {
  const fitted = fitModel("line", { x, y });
  const summary = bootstrapFit(line, { x, y }, fitted, { draws: 1000, seed: 11 });

  it("gives the closed-form OLS slope error for a straight line (68 % half-width within 8 %)", () => {
    // For a linear model the residual bootstrap's variance of the slope is s²/Sxx exactly in
    // expectation (Davison & Hinkley 1997, §6.2.3); 1,000 draws estimate it to a few per cent.
    const reference = olsSlopeError(x, y);
    const slope = summary.parameters[1];
    const halfWidth = (slope.interval68[1] - slope.interval68[0]) / 2;
    expect(slope.value).toBeCloseTo(reference.slope, 10);
    expect(halfWidth / reference.stderr).toBeGreaterThan(0.92);
    expect(halfWidth / reference.stderr).toBeLessThan(1.08);
    expect(slope.disagrees).toBe(false);
    expect(summary.used).toBe(1000);
    expect(summary.warnings).toEqual([]);
  });

  it("puts the 95 % interval around the fitted value and outside the 68 % one", () => {
    for (const p of summary.parameters) {
      expect(p.interval95[0]).toBeLessThan(p.interval68[0]);
      expect(p.interval68[0]).toBeLessThan(p.value);
      expect(p.value).toBeLessThan(p.interval68[1]);
      expect(p.interval68[1]).toBeLessThan(p.interval95[1]);
    }
  });

  it("depends on the seed and the draw count only, not on how the draws are split", () => {
    const whole = bootstrapDraws(line, { x, y }, fitted, 11, 0, 50);
    const split = [...bootstrapDraws(line, { x, y }, fitted, 11, 0, 17), ...bootstrapDraws(line, { x, y }, fitted, 11, 17, 50)];
    expect(split).toEqual(whole);
    const other = bootstrapDraws(line, { x, y }, fitted, 12, 0, 50);
    expect(other).not.toEqual(whole);
  });

  it("keeps each point's own σ when the fit is weighted", () => {
    // Points beyond x = 5 carry ten times the noise and say so through σ; the slope's bootstrap
    // spread then follows the weighted closed form, not the unweighted one.
    const sigma = x.map((xi) => (xi > 5 ? 3 : 0.3));
    const noisy = x.map((xi, i) => 2 + 0.5 * xi + sigma[i] * seededRandom(100 + i).normal());
    const weighted = fitModel("line", { x, y: noisy, sigma });
    const result = bootstrapFit(line, { x, y: noisy, sigma }, weighted, { draws: 1000, seed: 3 });
    const slope = result.parameters[1];
    const halfWidth = (slope.interval68[1] - slope.interval68[0]) / 2;
    expect(halfWidth / slope.stderr).toBeGreaterThan(0.85);
    expect(halfWidth / slope.stderr).toBeLessThan(1.15);
  });
});

describe("disagreement with the covariance", () => {
  const fitted = fitModel("line", { x, y });
  const [a, b] = fitted.params;

  it("warns when the 68 % interval is more than 1.5× the standard error", () => {
    // Hand-made draws: half at value − 2·stderr, half at value + 2·stderr, so the 15.9 % and
    // 84.1 % percentiles sit there and the half-width is twice the standard error.
    const draws = Array.from({ length: 100 }, (_, i) => [a.value, b.value + (i < 50 ? -2 : 2) * b.stderr]);
    const summary = summariseBootstrap(line, fitted, draws, { draws: 100, seed: 1 });
    const slope = summary.parameters[1];
    expect(slope.ratio).toBeCloseTo(2, 10);
    expect(slope.disagrees).toBe(true);
    expect(summary.warnings.join(" ")).toContain(`${b.name}: the bootstrap's 68 % interval is 2× the standard error (wider)`);
  });

  it("counts refits that did not converge and leaves them out", () => {
    const draws = [[a.value, b.value - b.stderr], null, [a.value, b.value + b.stderr], null];
    const summary = summariseBootstrap(line, fitted, draws, { draws: 4, seed: 1 });
    expect(summary.used).toBe(2);
    expect(summary.warnings[0]).toBe("2 of 4 bootstrap refits did not converge and are left out of the intervals.");
  });
});
