/**
 * SVG → PNG with resvg, in this process: thumbnails and previews (small by construction). Print
 * rasters are drawn in the render worker (./to-print-raster.ts).
 */
import "server-only";
import { assertPrintableSvg, svgSizeMm } from "./svg-safety";
import { svgToPngCore, type RenderedPng } from "./worker/png-core.mjs";

export interface PngOptions {
  /** Dots per inch; 300 and 600 are the journal resolutions. */
  dpi?: number;
  /** Printed width, mm (default: the SVG's own width in mm). */
  widthMm?: number;
  /** tEXt chunks (PNG spec §11.3.4.3), e.g. { Description: "…" }; Latin-1 keys and values. */
  text?: Record<string, string>;
}

/** Rasterises a (safe) SVG at `dpi`: pixel width = widthMm / 25.4 × dpi. */
export function svgToPng(svg: string, options: PngOptions = {}): RenderedPng {
  assertPrintableSvg(svg);
  return svgToPngCore(svg, { dpi: options.dpi ?? 300, widthMm: options.widthMm ?? svgSizeMm(svg).widthMm, text: options.text });
}
