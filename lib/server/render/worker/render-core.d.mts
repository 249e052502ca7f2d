/** Types of render-core.mjs (plain JavaScript so the render worker can load it without a build step). */

export { PT_PER_MM, RenderError, rootSize, type RenderErrorCode } from "./render-error.mjs";

export interface PhysicalSize {
  /** Printed width, mm. */
  widthMm: number;
  /** Printed height, mm; when absent the spec's own height (in pt) is kept. */
  heightMm?: number;
}

export type BoundData = Record<string, object[]>;

export interface RenderedSvg {
  svg: string;
  /** Natural size of the drawing in SVG user units, which are points (1/72 in). */
  widthPx: number;
  heightPx: number;
  widthMm: number;
  heightMm: number;
  /** Vega-Lite and Vega warnings, deduplicated. */
  warnings: string[];
  /** Distance of the plotting area from each edge of the drawing, pt; null when it has none. */
  plot: PlotMargins | null;
}

export interface PlotMargins {
  left: number;
  top: number;
  right: number;
  bottom: number;
}

/** Room added to the spec's padding, pt (moves the plotting area in). */
export interface ExtraPadding {
  left?: number;
  top?: number;
  bottom?: number;
}

export declare function renderSpecToSvgCore(spec: unknown, data: BoundData, size: PhysicalSize, extraPadding?: ExtraPadding): Promise<RenderedSvg>;

export declare function renderOnce(
  vlSpec: unknown,
  data: BoundData,
  sinks?: { warnings?: string[]; refusals?: string[] },
): Promise<{ svg: string; width: number; height: number; warnings: string[]; plot: PlotMargins | null }>;

export declare function boundDataNames(vlSpec: unknown): string[];
export declare function refusingLoader(refusals: string[]): unknown;
export declare function setPhysicalSize(svg: string, width: number, height: number, widthMm: number, heightMm: number): string;
export declare function normaliseIds(svg: string): string;
