/**
 * Checks on an SVG before a rasteriser or the PDF writer sees it. Our SVGs come from Vega with a
 * refusing loader, but resvg and svg-to-pdfkit would both read an <image> from the file system,
 * so anything that could reach outside the document is refused here as well.
 */
import "server-only";
import { RenderError } from "./worker/render-error.mjs";

const FORBIDDEN = [
  { re: /<!(?:DOCTYPE|ENTITY)/i, what: "a DOCTYPE or entity declaration" },
  { re: /<\s*(?:[a-z]+:)?(?:image|foreignObject|script|iframe|object|embed)\b/i, what: "an image, script or embedded object" },
  { re: /\s(?:xlink:)?href\s*=\s*["'](?!#)/i, what: "a link to another document" },
  { re: /url\(\s*["']?(?!#)/i, what: "a url() reference outside the document" },
  { re: /@import/i, what: "a stylesheet import" },
];

/** Throws RenderError("unsafe-svg") if the SVG could load anything from outside itself. */
export function assertPrintableSvg(svg: string): void {
  for (const { re, what } of FORBIDDEN) {
    if (re.test(svg)) throw new RenderError("unsafe-svg", `the SVG contains ${what}; it is not exported`);
  }
}

/** Physical size from the root element's width/height in mm (as our renderer writes them). */
export function svgSizeMm(svg: string): { widthMm: number; heightMm: number } {
  const root = /<svg\b[^>]*>/.exec(svg)?.[0] ?? "";
  const widthMm = Number(/\swidth="([\d.]+)mm"/.exec(root)?.[1]);
  const heightMm = Number(/\sheight="([\d.]+)mm"/.exec(root)?.[1]);
  if (!(widthMm > 0 && heightMm > 0)) throw new RenderError("bad-size", "the SVG has no physical size (width/height in mm)");
  return { widthMm, heightMm };
}
