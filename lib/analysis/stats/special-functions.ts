/**
 * Special functions behind the p-values and quantiles of this folder, in plain TypeScript:
 * log-gamma, log-beta, the regularised incomplete beta and gamma functions and the complementary
 * error function. All arguments and results are dimensionless. Methods and sources are named on
 * each function; the coefficients were written down from memory of the cited sources and are
 * checked against SciPy (cross-checked with mpmath) in
 * tests/reference/stats/special-functions.reference.test.ts.
 */

/** ½·ln(2π). */
const LN_SQRT_2PI = 0.9189385332046728;
const SQRT_2PI = Math.sqrt(2 * Math.PI);
/** Lentz's guard against a zero denominator (Numerical Recipes, 3rd ed., §5.2). */
const TINY = 1e-300;
const EPS = Number.EPSILON;
/** Iteration cap for the series and continued fractions (never reached in the tested range). */
const MAX_ITERATIONS = 100_000;

/**
 * Lanczos coefficients for g = 7, n = 9 (the set popularised by P. Godfrey and quoted in
 * Numerical Recipes / Wikipedia's "Lanczos approximation"; from memory):
 * Γ(z + 1) = √(2π) (z + g + ½)^(z + ½) e^(−(z + g + ½)) [c₀ + Σ_{k=1..8} c_k/(z + k)].
 */
const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905, -0.13857109526572012,
  9.9843695780195716e-6, 1.5056327351493116e-7,
];

/**
 * Stirling correction δ(x) = lnΓ(x) − [(x − ½)ln x − x + ½ln(2π)] for x ≥ 10, from the asymptotic
 * series Σ B₂ₖ/(2k(2k − 1) x^(2k−1)) (DLMF 5.11.1) truncated after B₁₆; the first omitted term is
 * below 1e-17 at x = 10.
 */
function stirlingCorrection(x: number): number {
  const r = 1 / x;
  const r2 = r * r;
  return r * (1 / 12 + r2 * (-1 / 360 + r2 * (1 / 1260 + r2 * (-1 / 1680 + r2 * (1 / 1188 + r2 * (-691 / 360360 + r2 * (1 / 156 + r2 * (-3617 / 122400))))))));
}

/**
 * ln(ratio) − (ratio − 1) for ratio = x/x₀ = 1 + u, where u = (x − x₀)/x₀ is passed as well: the
 * series of log1pmx near ratio = 1, the logarithm of the ratio formed from x and x₀ themselves
 * (not from 1 + u, which would lose x when x ≪ x₀) elsewhere.
 */
function logRatioMinusLinear(x: number, x0: number, u: number): number {
  return Math.abs(u) <= 0.5 ? log1pmx(u) : Math.log(x / x0) - u;
}

/** ln(1 + u) − u for u > −1 without cancellation near 0, via ln(1 + u) = 2·atanh(u/(2 + u)). */
function log1pmx(u: number): number {
  if (!(Math.abs(u) <= 0.5)) return Math.log1p(u) - u;
  const r = u / (2 + u);
  const r2 = r * r;
  // ln(1 + u) − u = −r·u + 2(r³/3 + r⁵/5 + …), since 2r − u = −r·u; |r| ≤ ⅓ here.
  let term = r2 * r;
  let sum = 0;
  for (let k = 3; k < 200; k += 2) {
    const add = term / k;
    sum += add;
    if (Math.abs(add) <= 1e-17 * Math.abs(sum)) break;
    term *= r2;
  }
  return 2 * sum - r * u;
}

/**
 * ln Γ(x) for x > 0 (NaN otherwise). Lanczos approximation (g = 7, n = 9; C. Lanczos, SIAM J. Numer.
 * Anal. B 1, 86 (1964); Numerical Recipes §6.1) for 0.5 ≤ x < 10, reflection Γ(x)Γ(1 − x) = π/sin(πx)
 * (DLMF 5.5.3) below 0.5, Stirling's series (DLMF 5.11.1) from 10 on. Absolute error ≲ 2e-15 (so the
 * relative error is large only next to the zeros at x = 1 and x = 2).
 */
export function logGamma(x: number): number {
  if (!(x > 0)) return NaN;
  if (x === Infinity) return Infinity;
  if (x >= 10) return (x - 0.5) * Math.log(x) - x + LN_SQRT_2PI + stirlingCorrection(x);
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  const z = x - 1;
  let s = LANCZOS[0];
  for (let k = 1; k < LANCZOS.length; k++) s += LANCZOS[k] / (z + k);
  const t = z + LANCZOS_G + 0.5;
  return LN_SQRT_2PI + (z + 0.5) * Math.log(t) - t + Math.log(s);
}

/**
 * ln B(a, b) = lnΓ(a) + lnΓ(b) − lnΓ(a + b) for a, b > 0. When an argument is ≥ 10 the Stirling forms
 * of the large Gamma functions are combined first so their O(x ln x) parts cancel analytically
 * (the device of DiDonato & Morris, ACM TOMS 18, 360 (1992), from memory); relative error ≲ 1e-13
 * against mpmath for a + b up to 2e8 (and a up to 5e11 with b = ½).
 */
export function logBeta(a: number, b: number): number {
  if (!(a > 0 && b > 0)) return NaN;
  const lo = Math.min(a, b);
  const hi = Math.max(a, b);
  if (hi < 10) return logGamma(a) + logGamma(b) - logGamma(a + b);
  const s = a + b;
  if (lo < 10) {
    // lnΓ(hi) − lnΓ(hi + lo) = −(hi − ½)·ln(1 + lo/hi) − lo·ln(s) + lo + δ(hi) − δ(s)
    return logGamma(lo) - (hi - 0.5) * Math.log1p(lo / hi) - lo * Math.log(s) + lo + stirlingCorrection(hi) - stirlingCorrection(s);
  }
  return (
    LN_SQRT_2PI -
    (a - 0.5) * Math.log1p(b / a) -
    (b - 0.5) * Math.log1p(a / b) -
    0.5 * Math.log(s) +
    stirlingCorrection(a) +
    stirlingCorrection(b) -
    stirlingCorrection(s)
  );
}

/**
 * x^a·y^b / B(a, b) with y = 1 − x supplied by the caller (computed without cancellation).
 * For a, b ≥ 10 Stirling's formula is used for all three Gamma functions and the exponent is written
 * as a·[ln(1+u) − u] + b·[ln(1+v) − v] + ½ln(ab/(2π(a+b))) − δ(a) − δ(b) + δ(a+b) with x = x₀(1+u),
 * x₀ = a/(a+b), y = y₀(1+v): the linear terms cancel exactly, so no large logarithms are subtracted
 * (after DiDonato & Morris 1992, "brcomp"; from memory).
 */
function betaPrefactor(a: number, b: number, x: number, y: number): number {
  if (a >= 10 && b >= 10) {
    const s = a + b;
    const x0 = a / s;
    const y0 = b / s;
    const e = x <= 0.5 ? x - x0 : y0 - y; // = x − x₀ = y₀ − y, from the coordinate held more precisely
    const exponent =
      a * logRatioMinusLinear(x, x0, e / x0) +
      b * logRatioMinusLinear(y, y0, -e / y0) +
      0.5 * Math.log(a * y0) -
      LN_SQRT_2PI -
      stirlingCorrection(a) -
      stirlingCorrection(b) +
      stirlingCorrection(s);
    return Math.exp(exponent);
  }
  const lnX = x <= 0.5 ? Math.log(x) : Math.log1p(-y);
  const lnY = y <= 0.5 ? Math.log(y) : Math.log1p(-x);
  return Math.exp(a * lnX + b * lnY - logBeta(a, b));
}

/**
 * Continued fraction of DLMF 8.17.22 for I_x(a, b) = x^a(1−x)^b/(a·B(a,b)) · 1/(1+ d₁/(1+ d₂/(1+ …))),
 * d₂ₘ = m(b−m)x/((a+2m−1)(a+2m)), d₂ₘ₊₁ = −(a+m)(a+b+m)x/((a+2m)(a+2m+1)), evaluated by the modified
 * Lentz method as in Numerical Recipes §6.4 ("betacf"). Returns the fraction (the factor after the dot
 * times a); converges quickly for x < (a+1)/(a+b+2).
 */
function betaContinuedFraction(a: number, b: number, x: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= MAX_ITERATIONS; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) <= EPS) break;
  }
  return h;
}

/** When regularizedIncompleteBetaPair uses betaLargeA(a, b, y) (tested against mpmath). */
function largeACase(a: number, b: number, y: number): boolean {
  return a >= 15 && (b <= 5 || a >= 1000 * b) && y <= 0.5;
}

/**
 * I_x(a, b) for large a and small b with x = 1 − y near 1, by the asymptotic expansion in 1/T,
 * T = a + (b − 1)/2, of DiDonato & Morris (ACM TOMS 18, 360 (1992), §9, their routine BGRAT), derived
 * again here: with t = e^(−u/T) in B(a,b)·I_x(a,b) = ∫₀ˣ t^(a−1)(1−t)^(b−1) dt and z = −T·ln x,
 *   I_x(a, b) = M · Σₙ Dₙ (2T)^(−2n) Γ(b + 2n, z)/Γ(b),   M = Γ(a + b)/(Γ(a)·T^b),
 * where Σₙ Dₙ wⁿ = [sinh(√w)/√w]^(b−1) (J. C. P. Miller's recurrence for the power of a series) and
 * Γ(s + 2, z) = s(s+1)Γ(s, z) + z^s e^(−z)(s + 1 + z) (DLMF 8.8.2 twice). The n = 0 term is M·Q(b, z).
 * Unlike the continued fraction, it takes y (through z = −T·ln(1 − y)), not the rounded x, so I_x
 * keeps its relative accuracy when a·y is moderate and a is huge (the continued fraction loses
 * about a·ε there). Needs a ≥ 15, y ≤ ½ (the series is in (ln x / 2)² ≤ 0.12).
 */
function betaLargeA(a: number, b: number, y: number): number {
  const T = a + (b - 1) / 2;
  const lnX = Math.log1p(-y);
  const z = -T * lnX;
  // ln M = lnΓ(a+b) − lnΓ(a) − b·ln T, with Stirling for both Gammas and a + b − T = (b + 1)/2.
  const lnM = (a - 0.5) * Math.log1p(b / a) - b + b * Math.log1p((b + 1) / (2 * T)) - stirlingCorrection(a) + stirlingCorrection(a + b);
  const M = Math.exp(lnM);
  const Q = regularizedGammaPair(b, z).q;
  const R = Math.exp(b * Math.log(z) - z - logGamma(b)); // z^b e^(−z)/Γ(b)
  if (!(R > 0)) return M * Q;
  // jₙ = Γ(b + 2n, z)/(Γ(b)·R·(2T)^(2n)); cₖ = 1/(2k+1)!; D₀ = 1.
  const v = 1 / (4 * T * T);
  const t2 = 0.25 * lnX * lnX; // (z/(2T))²
  const c: number[] = [1];
  const D: number[] = [1];
  let j = Q / R;
  let tPow = 1; // (z/(2T))^(2(n−1))
  let sum = 0;
  for (let n = 1; n <= 30; n++) {
    const s = b + 2 * (n - 1);
    j = (s * (s + 1) * j + (z + s + 1) * tPow) * v;
    tPow *= t2;
    c[n] = c[n - 1] / (2 * n * (2 * n + 1));
    let acc = 0;
    for (let k = 1; k < n; k++) acc += (b * k - n) * c[k] * D[n - k];
    D[n] = (b - 1) * c[n] + acc / n;
    const term = D[n] * j;
    sum += term;
    if (Math.abs(term) <= 1e-17 * Math.abs(Q / R + sum)) break;
  }
  return M * (Q + R * sum);
}

/**
 * I_x(a, b) and its complement 1 − I_x(a, b) = I_y(b, a), each computed without cancellation where
 * it is small. x and y = 1 − x are both passed so that a caller who knows the small one exactly
 * (e.g. y = t²/(ν + t²)) does not lose it to rounding in 1 − x. Method: Numerical Recipes §6.4
 * ("betai"): the continued fraction for I_x(a, b) when x < (a+1)/(a+b+2), else for I_y(b, a); the
 * switch is tested on the smaller of x and y so it stays exact for a + b ~ 1e300. In the first case
 * with a ≥ 15, b ≤ 5 (or a ≥ 1000·b) and y ≤ ½ (large-df tails of t and F) the expansion of
 * betaLargeA replaces the continued fraction, whose coefficients would see only the rounded x; the
 * second case mirrors it. Relative error against mpmath (50 digits), results above 1e-300:
 * ≲ 2e-13 for a, b ≤ 2e6 (the worst in the deepest tails, where the rounding of an exponent of
 * several hundred dominates), ≲ 2e-12 when both a and b exceed ~1e5 (the continued fraction then
 * loses ~min(a, b)·ε); I_½(5e8, 5e8) comes out as 0.5 + 2.4e-12.
 */
export function regularizedIncompleteBetaPair(x: number, y: number, a: number, b: number): { p: number; q: number } {
  if (!(a > 0 && b > 0) || !(x >= 0 && y >= 0) || Number.isNaN(x + y)) return { p: NaN, q: NaN };
  if (x === 0) return { p: 0, q: 1 };
  if (y === 0) return { p: 1, q: 0 };
  const direct = x <= 0.5 ? x * (a + b + 2) < a + 1 : y * (a + b + 2) > b + 1;
  if (direct && largeACase(a, b, y)) {
    const p = Math.min(1, betaLargeA(a, b, y));
    return { p, q: 1 - p };
  }
  if (!direct && largeACase(b, a, x)) {
    const q = Math.min(1, betaLargeA(b, a, x));
    return { p: 1 - q, q };
  }
  const front = betaPrefactor(a, b, x, y);
  if (direct) {
    const p = Math.min(1, (front * betaContinuedFraction(a, b, x)) / a);
    return { p, q: 1 - p };
  }
  const q = Math.min(1, (front * betaContinuedFraction(b, a, y)) / b);
  return { p: 1 - q, q };
}

/** Regularised incomplete beta I_x(a, b) for 0 ≤ x ≤ 1, a, b > 0 (see regularizedIncompleteBetaPair). */
export function regularizedIncompleteBeta(x: number, a: number, b: number): number {
  if (!(x >= 0 && x <= 1)) return NaN;
  return regularizedIncompleteBetaPair(x, 1 - x, a, b).p;
}

/**
 * x^a e^(−x)/Γ(a). For a ≥ 10 written as exp(a·[ln(1+u) − u] + ½ln(a/2π) − δ(a)) with x = a(1+u),
 * so that a·ln x, x and lnΓ(a) are not subtracted from one another (Temme's device; from memory).
 */
function gammaPrefactor(a: number, x: number): number {
  if (a >= 10) return Math.exp(a * logRatioMinusLinear(x, a, (x - a) / a) + 0.5 * Math.log(a) - LN_SQRT_2PI - stirlingCorrection(a));
  return Math.exp(a * Math.log(x) - x - logGamma(a));
}

/** Σₙ xⁿ/(a(a+1)…(a+n)); P(a, x) = x^a e^(−x)/Γ(a) times this (DLMF 8.7.1; Numerical Recipes §6.2 "gser"). */
function gammaSeries(a: number, x: number): number {
  let ap = a;
  let del = 1 / a;
  let sum = del;
  for (let n = 0; n < MAX_ITERATIONS; n++) {
    ap += 1;
    del *= x / ap;
    sum += del;
    if (Math.abs(del) <= Math.abs(sum) * EPS) break;
  }
  return sum;
}

/**
 * Legendre's continued fraction Γ(a, x) = x^a e^(−x) · 1/(x+1−a− 1·(1−a)/(x+3−a− 2·(2−a)/(x+5−a− …)))
 * (DLMF 8.9.2 in its even form; Numerical Recipes §6.2 "gcf"), by the modified Lentz method; Q(a, x) =
 * x^a e^(−x)/Γ(a) times the returned fraction. Converges quickly for x > a + 1.
 */
function gammaContinuedFraction(a: number, x: number): number {
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i <= MAX_ITERATIONS; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) <= EPS) break;
  }
  return h;
}

/**
 * Regularised incomplete gamma P(a, x) = γ(a, x)/Γ(a) and Q(a, x) = Γ(a, x)/Γ(a) = 1 − P, for a > 0,
 * x ≥ 0: series for P when x < a + 1, continued fraction for Q otherwise (Numerical Recipes §6.2),
 * the other obtained as 1 − it. Intended for moderate a (≲ 1e5: the series needs O(√a) terms).
 */
export function regularizedGammaPair(a: number, x: number): { p: number; q: number } {
  if (!(a > 0) || !(x >= 0)) return { p: NaN, q: NaN };
  if (x === 0) return { p: 0, q: 1 };
  if (x === Infinity) return { p: 1, q: 0 };
  const front = gammaPrefactor(a, x);
  if (x < a + 1) {
    const p = Math.min(1, front * gammaSeries(a, x));
    return { p, q: 1 - p };
  }
  const q = Math.min(1, front * gammaContinuedFraction(a, x));
  return { p: 1 - q, q };
}

/** P(a, x), the regularised lower incomplete gamma function (see regularizedGammaPair). */
export function regularizedGammaP(a: number, x: number): number {
  return regularizedGammaPair(a, x).p;
}

/** Q(a, x) = 1 − P(a, x), the regularised upper incomplete gamma function (see regularizedGammaPair). */
export function regularizedGammaQ(a: number, x: number): number {
  return regularizedGammaPair(a, x).q;
}

/**
 * e^(−s·z²) for z ≥ 0 and s ∈ {1, ½}, with z² split as h² + (z − h)(z + h), h = z truncated to 16
 * binary places, so h² is exact and the rounding of z² (relative error ~ z²·ε in the result) does not
 * enter (the device of W. J. Cody's erfc, Math. Comp. 23, 631 (1969); from memory).
 */
function expNegScaledSquare(z: number, s: number): number {
  const h = Math.trunc(z * 65536) / 65536;
  return Math.exp(-s * h * h) * Math.exp(-s * (z - h) * (z + h));
}

/**
 * P(½, X) and Q(½, X) with the prefactor X^½ e^(−X)/Γ(½) supplied by the caller (who can compute
 * it more precisely than from X): series below X = 1.5, continued fraction above.
 */
function halfGammaPair(X: number, front: number): { p: number; q: number } {
  if (X < 1.5) {
    const p = Math.min(1, front * gammaSeries(0.5, X));
    return { p, q: 1 - p };
  }
  const q = Math.min(1, front * gammaContinuedFraction(0.5, X));
  return { p: 1 - q, q };
}

/**
 * Complementary error function erfc(x) = Q(½, x²) for x ≥ 0 (DLMF 7.11.2 with 8.2.4), 2 − erfc(−x)
 * for x < 0; evaluated by the incomplete-gamma series / continued fraction above. Relative error
 * ≲ 1e-14 wherever the result is a normal double (x ≲ 26.5).
 */
export function erfc(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x < 0) return 2 - erfc(-x);
  if (x > 27) return 0;
  return halfGammaPair(x * x, (x * expNegScaledSquare(x, 1)) / Math.sqrt(Math.PI)).q;
}

/**
 * Standard-normal probabilities for z ≥ 0: upper = P(Z ≥ z) = ½·Q(½, z²/2), central = P(0 ≤ Z ≤ z)
 * = ½·P(½, z²/2) (DLMF 7.2.2, 7.11.1–2, 8.2.4) and lower = P(Z ≤ z) = ½ + central, each accurate
 * where it is small: z²/2 is exact, and e^(−z²/2) is split as in expNegScaledSquare.
 */
export function standardNormalTails(z: number): { upper: number; central: number; lower: number } {
  if (Number.isNaN(z) || z < 0) return { upper: NaN, central: NaN, lower: NaN };
  if (z > 40) return { upper: 0, central: 0.5, lower: 1 };
  const { p, q } = halfGammaPair(0.5 * z * z, (z * expNegScaledSquare(z, 0.5)) / SQRT_2PI);
  return { upper: 0.5 * q, central: 0.5 * p, lower: 0.5 + 0.5 * p };
}
