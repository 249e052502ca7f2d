/** First characters of a content hash, enough to tell revisions apart on screen. */
export const shortHash = (h: string | null | undefined, n = 10) => (h ? h.slice(0, n) : "—");

/** Data coordinates for anchors and labels: 3–4 significant figures, no trailing noise. */
export function formatValue(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  const a = Math.abs(v);
  if (a !== 0 && (a >= 1e5 || a < 1e-3)) return v.toExponential(2);
  return String(Number(v.toPrecision(4)));
}

export function describeAnchor(a: { type: "point"; x: number; y: number } | { type: "xrange"; x0: number; x1: number } | null | undefined): string {
  if (!a) return "the whole panel";
  return a.type === "point" ? `point x = ${formatValue(a.x)}, y = ${formatValue(a.y)}` : `x-range ${formatValue(a.x0)} – ${formatValue(a.x1)}`;
}

export function timeAgo(when: string | Date, now = Date.now()): string {
  const s = Math.round((now - new Date(when).getTime()) / 1000);
  if (s < 60) return "just now";
  if (s < 3600) return `${Math.floor(s / 60)} min ago`;
  if (s < 86400) return `${Math.floor(s / 3600)} h ago`;
  return new Date(when).toISOString().slice(0, 10);
}

export const WIDTH_PRESETS = [
  { id: "single", label: "Single column · 89 mm", mm: 89 },
  { id: "one-and-a-half", label: "1.5 column · 120 mm", mm: 120 },
  { id: "double", label: "Double column · 183 mm", mm: 183 },
] as const;

export function presetFor(mm: number): string {
  return WIDTH_PRESETS.find((p) => p.mm === mm)?.id ?? "custom";
}

/** Width of one panel on the figure's grid, mm (2 mm gutters). */
export const GUTTER_MM = 2;
export function panelWidthMm(figure: { widthMm: number; columns: number }, colSpan: number): number {
  const cols = Math.max(1, figure.columns);
  const span = Math.min(cols, Math.max(1, colSpan));
  const col = (figure.widthMm - GUTTER_MM * (cols - 1)) / cols;
  return col * span + GUTTER_MM * (span - 1);
}
