/**
 * Raster files for print (PNG with pHYs and tEXt, LZW TIFF; RGB or grey, flattened onto white),
 * drawn in the render worker so that a 1200 dpi bitmap never sits in the server's memory. The
 * drawing itself is ./worker/png-core.mjs.
 */
import "server-only";
import { drawInWorker } from "./render-in-worker";
import { assertPrintableSvg, svgSizeMm } from "./svg-safety";
import type { PrintRaster, RasterJob } from "./worker/png-core.mjs";

export interface PrintRasterOptions {
  dpi: number;
  colour: RasterJob["colour"];
  /** Printed width, mm (default: the SVG's own width in mm). */
  widthMm?: number;
  /** One line about the file (draft or signed off, figure hash), written as the PNG's Description. */
  description?: string;
}

function printRaster(svg: string, format: RasterJob["format"], o: PrintRasterOptions): Promise<PrintRaster> {
  assertPrintableSvg(svg);
  const job: RasterJob = { format, dpi: o.dpi, colour: o.colour, widthMm: o.widthMm ?? svgSizeMm(svg).widthMm, description: o.description };
  return drawInWorker<PrintRaster>({ kind: "raster", svg, options: job });
}

export function printPng(svg: string, o: PrintRasterOptions): Promise<PrintRaster> {
  return printRaster(svg, "png", o);
}

export function printTiff(svg: string, o: PrintRasterOptions): Promise<PrintRaster> {
  return printRaster(svg, "tiff", o);
}
