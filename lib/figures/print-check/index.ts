/**
 * The print check of a figure (issue 14): the rules a journal's figure guide and a careful reader
 * apply before the PI signs off, each one pure so it can be tested with seeded faults. The server
 * (lib/server/figures/print-check.ts) gathers the inputs: the composed figure SVG at its target
 * width, the panels' stored specs and words, the bound versions.
 *
 * Rules, as the checklist states them:
 * - text: every text of the composed SVG prints at ≥ 5 pt (journals ask 5–7 pt). The SVG's user
 *   units are points; a text's printed size is its font-size × the scale of every nested <svg>
 *   (width ÷ viewBox width, "meet") and transform around it, × the root's mm → pt scale.
 * - size: the drawn figure is its target width and no taller than the figure's maximum height.
 * - axes: every drawn x/y axis has a title (Vega-Lite's default, the column name, does not count);
 *   a quantitative axis's title ends in a unit in parentheses after a space — "τ (µs)", "PL (norm.)",
 *   "signal (a.u.)" — or its last word names a dimensionless quantity (DIMENSIONLESS_WORDS:
 *   "coherence", "normalised contrast", "residual"). Nominal, ordinal and time axes need a title only;
 *   an axis drawn without labels (one that shares its scale with a panel below) needs none.
 * - colours: the data colours of each panel (fills and strokes of its point, line, area, bar and tick
 *   marks; not rules, text, axes or legends, not white) are simulated for deuteranopia, protanopia and
 *   tritanopia with the Machado, Oliveira & Fernandes (2009) matrices at severity 1.0 and every pair
 *   must differ by CIEDE2000 ΔE00 ≥ MIN_CVD_DELTA_E00 under each. A mark group of more than
 *   CONTINUOUS_COLOURS colours is a continuous colour scale and is not compared pairwise.
 * - error bars: a panel that draws error bars (errorbar/errorband marks, xError/yError channels) says
 *   what they are — standard deviation, standard error, confidence interval, IQR, percentiles or
 *   min–max — in its own words (the spec's description or title, the panel title, the current
 *   revision's message), or the bound file's header defines the error column
 *   (`# sigma: standard error of the mean over 20 blocks`).
 * - n: a panel that summarises groups (an aggregate in an encoding or transform, an errorbar,
 *   errorband or boxplot over groups) states n: drawn in the panel ("n = 4") or written in its words.
 * - raster: every resolution the raster exports accept is ≥ 300 dpi.
 * - latest data: every bound dataset version (and every fitted input version) is its dataset's latest,
 *   unless the current revision's message keeps it on purpose ("keep version 1: …").
 */
import type { PrintCheck } from "./types";

export type { OlderVersion, PrintCheck, PrintCheckId, PrintCheckItem } from "./types";
export { readFigureSvg, transformScale, type SvgMarkColours, type SvgText } from "./svg-reading";
export { checkFigureSize, checkTextSizes } from "./text-and-size";
export { axisTitleProblem, checkAxes, specAxes } from "./axes";
export { checkColourPairs, cvdDeltaE, MACHADO_2009, MIN_CVD_DELTA_E00, type Deficiency } from "./colours";
export { checkErrorBars, checkGroupN, definesErrorBars, specGroupsData, type PanelWords } from "./error-bars-and-n";
export { checkLatestVersions, checkRasterDpi, keepsVersion, type BoundVersion } from "./raster-and-versions";

/** One line per failure, "rule: problem", for the sign-off's reason prompt and its audit entry. */
export function printCheckFailures(check: PrintCheck): string[] {
  return check.items.flatMap((i) => (i.ok ? [] : i.problems.length ? i.problems.map((p) => `${i.label}: ${p}`) : [i.label]));
}
