/** Rules on the drawn figure: text sizes at the target width, and the figure within its width and height. */
import type { SvgText } from "./svg-reading";
import { inPanel, quote, round1, type PrintCheckItem } from "./types";

/** Journals ask for 5–7 pt text at the printed size. */
const MIN_TEXT_PT = 5;

/** Repeated lines once, with how many times they occur (a label drawn once per row). */
function* counted(lines: string[]): Generator<string> {
  const n = new Map<string, number>();
  for (const l of lines) n.set(l, (n.get(l) ?? 0) + 1);
  for (const [l, k] of n) yield k > 1 ? `${l} (${k} times)` : l;
}

export function checkTextSizes(texts: SvgText[], widthMm: number, minPt = MIN_TEXT_PT): PrintCheckItem {
  const small = texts.filter((t) => t.pt < minPt - 1e-6);
  const smallest = texts.reduce((m, t) => Math.min(m, t.pt), Infinity);
  return {
    id: "text-size",
    label: `Every text at least ${minPt} pt at ${widthMm} mm wide`,
    ok: small.length === 0,
    problems: [...counted(small.map((t) => `${quote(t.text)} in ${inPanel(t.panel)} prints at ${round1(t.pt)} pt`))],
    detail: texts.length ? `smallest text ${round1(smallest)} pt` : "no text",
  };
}

export function checkFigureSize(f: { widthMm: number; heightMm: number; targetWidthMm: number; maxHeightMm: number }): PrintCheckItem {
  const problems: string[] = [];
  if (Math.abs(f.widthMm - f.targetWidthMm) > 0.05) problems.push(`the figure is ${round1(f.widthMm)} mm wide, not ${f.targetWidthMm} mm`);
  if (f.heightMm > f.maxHeightMm + 0.05) problems.push(`the figure is ${round1(f.heightMm)} mm tall, above its maximum of ${f.maxHeightMm} mm`);
  return {
    id: "figure-size",
    label: `Within ${f.targetWidthMm} mm wide and ${f.maxHeightMm} mm tall`,
    ok: problems.length === 0,
    problems,
    detail: `${round1(f.widthMm)} × ${round1(f.heightMm)} mm`,
  };
}
