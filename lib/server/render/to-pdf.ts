/**
 * SVG → vector PDF, drawn in the render worker (./worker/pdf-core.mjs: pdfkit and svg-to-pdfkit with
 * the shipped faces). The page is the figure's printed size in points.
 */
import "server-only";
import { drawInWorker } from "./render-in-worker";
import { assertPrintableSvg, svgSizeMm } from "./svg-safety";
import type { PdfJob } from "./worker/pdf-core.mjs";
import { PT_PER_MM } from "./worker/render-error.mjs";

export interface PdfOptions {
  widthMm?: number;
  heightMm?: number;
  title?: string;
  /** The document's Subject (the export says there whether the figure was signed off). */
  subject?: string;
  /** Fixes the PDF's creation date (for reproducible files). */
  creationDate?: Date;
}

export async function svgToPdf(svg: string, options: PdfOptions = {}): Promise<Buffer> {
  assertPrintableSvg(svg);
  const own = options.widthMm !== undefined && options.heightMm !== undefined ? null : svgSizeMm(svg);
  const job: PdfJob = {
    widthPt: (options.widthMm ?? own!.widthMm) * PT_PER_MM,
    heightPt: (options.heightMm ?? own!.heightMm) * PT_PER_MM,
    title: options.title,
    subject: options.subject,
    creationDate: options.creationDate,
  };
  const bytes = await drawInWorker<Uint8Array>({ kind: "pdf", svg, options: job });
  return Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}
