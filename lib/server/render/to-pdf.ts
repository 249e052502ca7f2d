/**
 * SVG → vector PDF with pdfkit and svg-to-pdfkit. The page is the figure's printed size in
 * points; text is set in the embedded faces of the shipped families (Inter, Arimo); images and external documents are never
 * opened (svg-to-pdfkit would otherwise read an <image> path from disk).
 */
import "server-only";
import PDFDocument from "pdfkit";
import SVGtoPDF from "svg-to-pdfkit";
import { FONT_FACES, FONT_FAMILIES, fontPath, shippedFamily, type FontFace, type FontFamily } from "./fonts";
import { assertPrintableSvg, svgSizeMm } from "./svg-safety";
import { PT_PER_MM, RenderError } from "./worker/render-error.mjs";

export interface PdfOptions {
  widthMm?: number;
  heightMm?: number;
  title?: string;
  /** The document's Subject (the export says there whether the figure was signed off). */
  subject?: string;
  /** Fixes the PDF's creation date (for reproducible files). */
  creationDate?: Date;
}

/** pdfkit's name for one registered face: "Inter-bold", "Arimo-regular". */
const faceName = (family: FontFamily, face: FontFace) => `${family}-${face}`;

/** svg-to-pdfkit only knows bold or not: map numeric weights onto the faces we ship. */
function normaliseWeights(svg: string): string {
  return svg.replace(/font-weight="(\d{3})"/g, (_, w: string) => `font-weight="${Number(w) >= 600 ? "bold" : "normal"}"`);
}

/** Root sized in pt (no unit) so that, with assumePt, one user unit is one point on the page. */
function rootInPoints(svg: string, wPt: number, hPt: number): string {
  return svg.replace(/<svg\b[^>]*>/, (root) => root.replace(/\swidth="[^"]*"/, ` width="${wPt}"`).replace(/\sheight="[^"]*"/, ` height="${hPt}"`));
}

export async function svgToPdf(svg: string, options: PdfOptions = {}): Promise<Buffer> {
  assertPrintableSvg(svg);
  const own = options.widthMm !== undefined && options.heightMm !== undefined ? null : svgSizeMm(svg);
  const widthPt = (options.widthMm ?? own!.widthMm) * PT_PER_MM;
  const heightPt = (options.heightMm ?? own!.heightMm) * PT_PER_MM;
  const doc = new PDFDocument({
    size: [widthPt, heightPt],
    margin: 0,
    info: {
      Title: options.title ?? "Figure",
      ...(options.subject ? { Subject: options.subject } : {}),
      Producer: "Prooflight",
      Creator: "Prooflight",
      ...(options.creationDate ? { CreationDate: options.creationDate } : {}),
    },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  for (const family of FONT_FAMILIES) for (const face of FONT_FACES) doc.registerFont(faceName(family, face), fontPath(family, face));
  const warnings: string[] = [];
  try {
    SVGtoPDF(doc, rootInPoints(normaliseWeights(svg), widthPt, heightPt), 0, 0, {
      width: widthPt,
      height: heightPt,
      assumePt: true,
      preserveAspectRatio: "xMinYMin meet",
      fontCallback: (family, bold, italic) => faceName(shippedFamily(family), italic ? "italic" : bold ? "bold" : "regular"),
      imageCallback: () => "",
      documentCallback: () => null,
      warningCallback: (m) => warnings.push(m),
    });
  } catch (err) {
    throw new RenderError("render-failed", `the PDF could not be written: ${(err as Error).message}`);
  }
  doc.end();
  return done;
}
