/**
 * SVG → vector PDF with pdfkit and svg-to-pdfkit, in the render worker (drawing tens of thousands of
 * marks takes hundreds of MB for a moment; the server process never holds it). The page is the
 * figure's printed size in points; text is set in the embedded faces of the shipped families;
 * images and external documents are never opened (svg-to-pdfkit would otherwise read an <image>
 * path from disk). The caller has already refused any SVG that reaches outside itself.
 */
import PDFDocument from "pdfkit";
import SVGtoPDF from "svg-to-pdfkit";
import { FONT_FACES, FONT_FAMILIES, shippedFamily, fontPath } from "./fonts-core.mjs";
import { RenderError } from "./render-error.mjs";

/** pdfkit's name for one registered face: "Inter-bold", "Arimo-regular". */
const faceName = (family, face) => `${family}-${face}`;

/** svg-to-pdfkit only knows bold or not: map numeric weights onto the faces we ship. */
function normaliseWeights(svg) {
  return svg.replace(/font-weight="(\d{3})"/g, (_, w) => `font-weight="${Number(w) >= 600 ? "bold" : "normal"}"`);
}

/** Root sized in pt (no unit) so that, with assumePt, one user unit is one point on the page. */
function rootInPoints(svg, wPt, hPt) {
  return svg.replace(/<svg\b[^>]*>/, (root) => root.replace(/\swidth="[^"]*"/, ` width="${wPt}"`).replace(/\sheight="[^"]*"/, ` height="${hPt}"`));
}

/**
 * @param {string} svg
 * @param {{ widthPt: number, heightPt: number, title?: string, subject?: string, creationDate?: Date }} o
 * @returns {Promise<Uint8Array>}
 */
export function svgToPdfCore(svg, o) {
  const doc = new PDFDocument({
    size: [o.widthPt, o.heightPt],
    margin: 0,
    info: {
      Title: o.title ?? "Figure",
      ...(o.subject ? { Subject: o.subject } : {}),
      Producer: "Prooflight",
      Creator: "Prooflight",
      ...(o.creationDate ? { CreationDate: new Date(o.creationDate) } : {}),
    },
  });
  const chunks = [];
  const done = new Promise((resolve, reject) => {
    doc.on("data", (c) => chunks.push(c));
    doc.on("end", () => resolve(new Uint8Array(Buffer.concat(chunks))));
    doc.on("error", reject);
  });
  for (const family of FONT_FAMILIES) for (const face of FONT_FACES) doc.registerFont(faceName(family, face), fontPath(family, face));
  try {
    SVGtoPDF(doc, rootInPoints(normaliseWeights(svg), o.widthPt, o.heightPt), 0, 0, {
      width: o.widthPt,
      height: o.heightPt,
      assumePt: true,
      preserveAspectRatio: "xMinYMin meet",
      fontCallback: (family, bold, italic) => faceName(shippedFamily(family), italic ? "italic" : bold ? "bold" : "regular"),
      imageCallback: () => "",
      documentCallback: () => null,
      warningCallback: () => undefined,
    });
  } catch (err) {
    throw new RenderError("render-failed", `the PDF could not be written: ${err.message}`);
  }
  doc.end();
  return done;
}
