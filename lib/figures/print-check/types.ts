/** What a print check answers: one item per rule, with its problems in words. */

export type PrintCheckId = "text-size" | "figure-size" | "axis-units" | "colour-pairs" | "error-bars" | "group-n" | "raster-dpi" | "latest-data";

export interface PrintCheckItem {
  id: PrintCheckId;
  /** The rule in words, e.g. "Every text at least 5 pt at 183 mm". */
  label: string;
  ok: boolean;
  /** One sentence per failure, naming the panel. */
  problems: string[];
  /** What was found when it passes (or why nothing was there to check). */
  detail?: string;
  /** Latest data: the older versions that fail, each of which its panel could keep on purpose. */
  keep?: OlderVersion[];
}

/** An older dataset version a panel is bound to, which a new revision's message can keep on purpose. */
export interface OlderVersion {
  panelId: string;
  panel: string;
  dataset: string;
  number: number;
  latest: number;
}

export interface PrintCheck {
  ok: boolean;
  figureHash: string;
  items: PrintCheckItem[];
}

export const PT_PER_MM = 72 / 25.4;
export const round1 = (v: number) => (Math.round(v * 10) / 10).toFixed(1);
export const quote = (s: string) => `“${s.length > 40 ? `${s.slice(0, 39)}…` : s}”`;
export const inPanel = (letter: string | null) => (letter ? `panel ${letter}` : "the figure");
