/**
 * Matches a pattern of equally spaced lines (centre + k·spacing, k from `pattern`, ascending
 * in unit steps) to a list of detected line positions, e.g. the ¹⁴N triplet k = −1, 0, 1 or the
 * ¹⁵N doublet k = −½, ½. Positions and spacing share the data's x (or 1/x) unit.
 */
export interface PatternMatch {
  centre: number;
  spacing: number;
}

/**
 * Tries every pair of detected lines as neighbours in the pattern or as its outermost pair and
 * returns the `count` best-scoring distinct hypotheses (e.g. by summed power or dip depth).
 */
export function rankLinePatterns(
  lines: number[],
  pattern: readonly number[],
  score: (centre: number, spacing: number) => number,
  minSpacing: number,
  count: number,
): PatternMatch[] {
  const first = pattern[0];
  const last = pattern[pattern.length - 1];
  const scored: Array<PatternMatch & { value: number }> = [];
  const consider = (centre: number, spacing: number): void => {
    if (!(spacing >= minSpacing)) return;
    const duplicate = scored.some((h) => Math.abs(h.centre - centre) < minSpacing / 2 && Math.abs(h.spacing - spacing) < minSpacing / 2);
    if (!duplicate) scored.push({ centre, spacing, value: score(centre, spacing) });
  };
  for (const a of lines) {
    for (const b of lines) {
      const d = b - a;
      if (d <= 0) continue;
      for (let k = 0; k + 1 < pattern.length; k++) consider(a - pattern[k] * d, d);
      const spacing = d / (last - first);
      consider(a - first * spacing, spacing);
    }
  }
  scored.sort((p, q) => q.value - p.value);
  return scored.slice(0, count).map(({ centre, spacing }) => ({ centre, spacing }));
}

/** The best-scoring hypothesis of rankLinePatterns, if any. */
export function matchLinePattern(
  lines: number[],
  pattern: readonly number[],
  score: (centre: number, spacing: number) => number,
  minSpacing: number,
): PatternMatch | undefined {
  return rankLinePatterns(lines, pattern, score, minSpacing, 1)[0];
}
