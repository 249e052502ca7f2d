/**
 * Raster files for print: the figure drawn by resvg (./to-png.ts), flattened onto white and
 * written by sharp as RGB or greyscale, without an alpha channel (journals' figure checks refuse
 * transparency in raster art), with the resolution recorded in the file:
 * - PNG: pHYs (pixels per metre) and tEXt chunks;
 * - TIFF: LZW compression (lossless), XResolution/YResolution in pixels per inch (the draft mark
 *   is in the pixels; sharp cannot set the ImageDescription tag).
 */
import "server-only";
import sharp from "sharp";
import { setPngDpi, svgToPng } from "./to-png";

type RasterColour = "rgb" | "grey";

export interface PrintRasterOptions {
  dpi: number;
  colour: RasterColour;
  /** Printed width, mm (default: the SVG's own width in mm). */
  widthMm?: number;
  /** One line about the file (draft or signed off, figure hash), written as the PNG's Description. */
  description?: string;
}

export interface PrintRaster {
  bytes: Buffer;
  widthPx: number;
  heightPx: number;
  /** Channels in the file: 3 for RGB, 1 for greyscale. */
  channels: number;
}

function flattened(svg: string, o: PrintRasterOptions) {
  const drawn = svgToPng(svg, { dpi: o.dpi, widthMm: o.widthMm });
  const image = sharp(drawn.png).flatten({ background: "#ffffff" });
  return { image: o.colour === "grey" ? image.toColourspace("b-w") : image.toColourspace("srgb"), drawn };
}

export async function printPng(svg: string, o: PrintRasterOptions): Promise<PrintRaster> {
  const { image, drawn } = flattened(svg, o);
  const { data, info } = await image.png({ compressionLevel: 9 }).toBuffer({ resolveWithObject: true });
  const text = o.description ? { Description: o.description } : undefined;
  return { bytes: setPngDpi(data, o.dpi, text), widthPx: drawn.widthPx, heightPx: drawn.heightPx, channels: info.channels };
}

export async function printTiff(svg: string, o: PrintRasterOptions): Promise<PrintRaster> {
  const { image, drawn } = flattened(svg, o);
  const perMm = o.dpi / 25.4;
  const { data, info } = await image
    .tiff({ compression: "lzw", predictor: "horizontal", xres: perMm, yres: perMm, resolutionUnit: "inch" })
    .toBuffer({ resolveWithObject: true });
  return { bytes: data, widthPx: drawn.widthPx, heightPx: drawn.heightPx, channels: info.channels };
}
