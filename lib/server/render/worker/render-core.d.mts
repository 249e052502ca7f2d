/** Types of render-core.mjs (plain JavaScript so the render worker can load it without a build step). */

export declare const PT_PER_MM: number;

export type RenderErrorCode =
  | "invalid-spec"
  | "missing-data"
  | "load-refused"
  | "render-failed"
  | "bad-size"
  | "unsafe-svg"
  | "timeout"
  | "out-of-memory"
  | "worker-failed";

export declare class RenderError extends Error {
  constructor(code: RenderErrorCode, message: string);
  readonly code: RenderErrorCode;
}

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
}

export declare function renderSpecToSvgCore(spec: unknown, data: BoundData, size: PhysicalSize): Promise<RenderedSvg>;

export declare function renderOnce(
  vlSpec: unknown,
  data: BoundData,
  sinks?: { warnings?: string[]; refusals?: string[] },
): Promise<{ svg: string; width: number; height: number; warnings: string[] }>;

export declare function boundDataNames(vlSpec: unknown): string[];
export declare function refusingLoader(refusals: string[]): unknown;
export declare function rootSize(svg: string): { width: number; height: number };
export declare function setPhysicalSize(svg: string, width: number, height: number, widthMm: number, heightMm: number): string;
