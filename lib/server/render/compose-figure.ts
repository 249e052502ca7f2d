/**
 * A whole figure as one SVG: panels on a grid, each with its letter in bold 8 pt Inter at the top
 * left, root sized in mm. Implementation in ./worker/compose-core.mjs (shared with the worker).
 */
import "server-only";
import { composeFigureCore, type ComposedFigure, type FigureLayout, type PanelSvg } from "./worker/compose-core.mjs";

export { cellWidthMm, type ComposedFigure, type FigureLayout, type PanelSvg } from "./worker/compose-core.mjs";

/** The composed figure with its physical size. */
export function composeFigure(panels: PanelSvg[], layout: FigureLayout, widthMm: number): ComposedFigure {
  return composeFigureCore(panels, layout, widthMm);
}
