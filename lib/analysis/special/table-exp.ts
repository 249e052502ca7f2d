/**
 * exp(x) by table-driven range reduction (P. T. P. Tang, "Table-driven implementation of the
 * exponential function in IEEE floating-point arithmetic", ACM TOMS 15(2), 144–157, 1989):
 * x = (64m + j)·ln2/64 + r with |r| ≤ ln2/128, so exp(x) = 2^m · 2^(j/64) · exp(r), exp(r) from
 * a degree-5 polynomial (truncation below 4e-17 relative). Written out in JavaScript so the JIT
 * inlines it into a model's loop, where it runs about twice as fast as Math.exp; results agree
 * with Math.exp to a few units in the last place (see its test). Outside the normal range
 * (results below 2^-1022 or above the largest double), and for NaN, it defers to Math.exp.
 */

const STEPS = 64;
const SHIFTER = 6755399441055744;
const INV_STEP = STEPS / Math.LN2;
/** ln2/64 in two parts (fdlibm's split of ln2, divided by 64): k·HI is exact for |k| < 2^20. */
const STEP_HI = 6.9314718036912381649e-1 / STEPS;
const STEP_LO = 1.90821492927058770002e-10 / STEPS;

/** 2^(j/64), j = 0…63. */
const FRACTION = Float64Array.from({ length: STEPS }, (_, j) => 2 ** (j / STEPS));
/** 2^m for m = −1023…1023, built by exact doubling and halving. */
const POWER = (() => {
  const p = new Float64Array(2047);
  p[1023] = 1;
  for (let m = 1; m <= 1023; m++) p[1023 + m] = p[1022 + m] * 2;
  for (let m = 1; m <= 1023; m++) p[1023 - m] = p[1024 - m] / 2;
  return p;
})();
/** Results for x in (LOW, HIGH) are normal doubles and take the fast path. */
const LOW = -708.3;
const HIGH = 709.7;

export function tableExp(x: number): number {
  if (!(x > LOW && x < HIGH)) return Math.exp(x);
  // Rounded to the nearest integer by adding and taking away 1.5·2^52 (round-to-nearest-even).
  const k = x * INV_STEP + SHIFTER - SHIFTER;
  const r = x - k * STEP_HI - k * STEP_LO;
  const ki = k | 0;
  const j = ki & (STEPS - 1);
  const m = ki >> 6;
  const expm1 = r + r * r * (0.5 + r * (1 / 6 + r * (1 / 24 + r * (1 / 120 + r * (1 / 720)))));
  const f = FRACTION[j];
  return POWER[1023 + m] * (f + f * expm1);
}
