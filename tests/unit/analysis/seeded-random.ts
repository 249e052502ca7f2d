/** Deterministic pseudo-random numbers for synthetic-data tests: mulberry32 and Box–Muller. */
import { mulberry32 } from "@/lib/demo-data/prng";

export interface SeededRandom {
  /** Uniform in [0, 1). */
  uniform(): number;
  /** Standard normal. */
  normal(): number;
}

export function seededRandom(seed: number): SeededRandom {
  const uniform = mulberry32(seed);
  let spare: number | undefined;
  const normal = (): number => {
    if (spare !== undefined) {
      const value = spare;
      spare = undefined;
      return value;
    }
    let u = 0;
    while (u === 0) u = uniform();
    const v = uniform();
    const radius = Math.sqrt(-2 * Math.log(u));
    spare = radius * Math.sin(2 * Math.PI * v);
    return radius * Math.cos(2 * Math.PI * v);
  };
  return { uniform, normal };
}

export function linspace(from: number, to: number, count: number): number[] {
  return Array.from({ length: count }, (_, i) => from + ((to - from) * i) / (count - 1));
}

/** y = model(x) + N(0, noise²) for each x. */
export function synthesize(evaluate: (x: number, p: number[]) => number, params: number[], x: number[], noise: number, random: SeededRandom): number[] {
  return x.map((xi) => evaluate(xi, params) + noise * random.normal());
}
