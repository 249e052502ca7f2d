/** Types of compose-core.mjs. */

export interface PanelSvg {
  letter: string;
  svg: string;
  /** Natural size in SVG user units (pt); read from the SVG's viewBox when absent. */
  widthPx?: number;
  heightPx?: number;
  /** Columns the panel spans (default 1). */
  span?: number;
}

export interface FigureLayout {
  columns: number;
  /** Space between panels, mm (default 2). */
  gapMm?: number;
  /** Band above each row that holds the panel letters, mm (default 3). */
  letterBandMm?: number;
  /** Panel letters (the manuscript's house style): family (Inter or Arimo), size in pt (6–14), weight. */
  letterFont?: string;
  letterPt?: number;
  letterWeight?: "bold" | "normal";
  /** Line up the plotting areas: left edges down a column, top and bottom edges along a row (default true). */
  alignAxes?: boolean;
}

export interface ComposedFigure {
  svg: string;
  widthMm: number;
  heightMm: number;
  /** Size in SVG user units (pt). */
  widthPx: number;
  heightPx: number;
}

export declare function composeFigureCore(panels: PanelSvg[], layout: FigureLayout, widthMm: number): ComposedFigure;
export declare function cellWidthMm(widthMm: number, columns: number, span?: number, gapMm?: number): number;
export declare function prefixIds(svg: string, prefix: string): string;

export { gridPlacement, type GridCell } from "../../../figures/grid-placement.mjs";
