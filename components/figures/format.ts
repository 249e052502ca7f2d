import { formatNumber } from "@/lib/data/format";

/** Data coordinates for anchors and labels: 4 significant figures, no trailing noise. */
const formatValue = (v: number) => formatNumber(v, 4);

export function describeAnchor(a: { type: "point"; x: number; y: number } | { type: "xrange"; x0: number; x1: number } | null | undefined): string {
  if (!a) return "the whole panel";
  return a.type === "point" ? `point x = ${formatValue(a.x)}, y = ${formatValue(a.y)}` : `x-range ${formatValue(a.x0)} – ${formatValue(a.x1)}`;
}

/** Width of one panel on the figure's grid, mm (2 mm gutters). */
export const GUTTER_MM = 2;
export function panelWidthMm(figure: { widthMm: number; columns: number }, colSpan: number): number {
  const cols = Math.max(1, figure.columns);
  const span = Math.min(cols, Math.max(1, colSpan));
  const col = (figure.widthMm - GUTTER_MM * (cols - 1)) / cols;
  return col * span + GUTTER_MM * (span - 1);
}
