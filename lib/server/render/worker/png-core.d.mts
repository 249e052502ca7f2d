/** Types of png-core.mjs. */

export interface RenderedPng {
  png: Buffer;
  widthPx: number;
  heightPx: number;
  dpi: number;
}

export interface RasterJob {
  format: "png" | "tiff";
  dpi: number;
  colour: "rgb" | "grey";
  widthMm: number;
  description?: string;
}

export interface PrintRaster {
  bytes: Uint8Array;
  widthPx: number;
  heightPx: number;
  /** Channels in the file: 3 for RGB, 1 for greyscale. */
  channels: number;
}

export declare function setPngDpi(png: Buffer, dpi: number, text?: Record<string, string>): Buffer;
export declare function svgToPngCore(svg: string, o: { dpi: number; widthMm: number; text?: Record<string, string> }): RenderedPng;
export declare function printRasterCore(svg: string, o: RasterJob): Promise<PrintRaster>;
