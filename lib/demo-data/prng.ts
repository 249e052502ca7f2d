/**
 * Seeded pseudo-random numbers for the demo data: mulberry32 (a 32-bit generator with period
 * 2³², plenty for a few hundred thousand draws), Box–Muller Gaussians and Poisson counts.
 * Same seed → same sequence on every platform (integer arithmetic via Math.imul).
 */

/** mulberry32: returns a function giving uniform numbers in [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** 32-bit FNV-1a hash of a string, to derive one independent seed per demo file. */
function seedFromString(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** Mean above which Poisson counts are drawn from the normal approximation N(μ, μ). */
const POISSON_NORMAL_THRESHOLD = 30;

export class Rng {
  private readonly next: () => number;
  private spare: number | null = null;

  constructor(seed: number | string) {
    this.next = mulberry32(typeof seed === "string" ? seedFromString(seed) : seed);
  }

  /** Uniform in [0, 1). */
  uniform(): number {
    return this.next();
  }

  /** Uniform in [lo, hi). */
  between(lo: number, hi: number): number {
    return lo + (hi - lo) * this.next();
  }

  /** Integer in [lo, hi] inclusive. */
  integer(lo: number, hi: number): number {
    return lo + Math.floor(this.next() * (hi - lo + 1));
  }

  /** Gaussian N(mean, sd²) by the Box–Muller transform (the second variate is kept for the next call). */
  normal(mean = 0, sd = 1): number {
    if (this.spare !== null) {
      const z = this.spare;
      this.spare = null;
      return mean + sd * z;
    }
    const u1 = 1 - this.next(); // (0, 1]: log(u1) stays finite
    const u2 = this.next();
    const r = Math.sqrt(-2 * Math.log(u1));
    this.spare = r * Math.sin(2 * Math.PI * u2);
    return mean + sd * r * Math.cos(2 * Math.PI * u2);
  }

  /** Gaussian truncated to [lo, hi] by redrawing (for physical parameters such as T₂ > 0). */
  normalWithin(mean: number, sd: number, lo: number, hi: number): number {
    for (let i = 0; i < 1000; i++) {
      const v = this.normal(mean, sd);
      if (v >= lo && v <= hi) return v;
    }
    return Math.min(hi, Math.max(lo, mean));
  }

  /**
   * Poisson-distributed count with mean `mean`: Knuth's multiplication method for small means,
   * the normal approximation N(μ, μ) rounded to an integer (and floored at 0) for large ones.
   */
  poisson(mean: number): number {
    if (!(mean > 0)) return 0;
    if (mean >= POISSON_NORMAL_THRESHOLD) return Math.max(0, Math.round(this.normal(mean, Math.sqrt(mean))));
    const limit = Math.exp(-mean);
    let k = 0;
    let p = this.next();
    while (p > limit) {
      k++;
      p *= this.next();
    }
    return k;
  }
}
