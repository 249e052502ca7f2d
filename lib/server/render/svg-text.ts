/**
 * The two ways an exported SVG carries its text so that it prints the same on any machine:
 * - outlines: every glyph converted to a path by resvg (usvg) from the shipped fonts; nothing to
 *   install, text no longer editable;
 * - embedded: text stays text, and each shipped face it uses is embedded as an @font-face with
 *   the TTF inline, so editors and browsers draw it without the font installed.
 */
import "server-only";
import fs from "node:fs";
import { Resvg } from "@resvg/resvg-js";
import { FONT_FAMILY, fontFiles, fontPath, shippedFamily, type FontFace, type FontFamily } from "./fonts";
import { assertPrintableSvg, svgSizeMm } from "./svg-safety";

export type SvgText = "outlines" | "embedded";

const fmt = (v: number) => String(Math.round(v * 1000) / 1000);

/** Glyphs as paths; the root keeps the figure's size in mm. */
function svgTextAsOutlines(svg: string): string {
  assertPrintableSvg(svg);
  const { widthMm, heightMm } = svgSizeMm(svg);
  const out = new Resvg(svg, {
    font: { fontFiles: fontFiles(), loadSystemFonts: false, defaultFontFamily: FONT_FAMILY, sansSerifFamily: FONT_FAMILY },
    logLevel: "off",
  }).toString();
  return out.replace(/^\s*<svg\b[^>]*>/, (root) =>
    root
      .replace(/\swidth="[^"]*"/, ` width="${fmt(widthMm)}mm"`)
      .replace(/\sheight="[^"]*"/, ` height="${fmt(heightMm)}mm"`)
      .replace(/^<svg/, '<svg version="1.1"'),
  );
}

/** The shipped faces the SVG's text uses (family × regular/bold/italic). */
function facesUsed(svg: string): Array<{ family: FontFamily; face: FontFace }> {
  const used = new Map<string, { family: FontFamily; face: FontFace }>();
  for (const m of svg.matchAll(/<text\b([^>]*)>/g)) {
    const attrs = m[1];
    const family = shippedFamily(/\sfont-family="([^"]*)"/.exec(attrs)?.[1]);
    const weight = /\sfont-weight="([^"]*)"/.exec(attrs)?.[1] ?? "normal";
    const italic = /\sfont-style="italic"/.test(attrs);
    const face: FontFace = italic ? "italic" : weight === "bold" || Number(weight) >= 600 ? "bold" : "regular";
    used.set(`${family}/${face}`, { family, face });
  }
  return [...used.values()].sort((a, b) => `${a.family}/${a.face}`.localeCompare(`${b.family}/${b.face}`));
}

/** Text kept as text, with the faces it uses embedded (one @font-face per family and face). */
function svgWithEmbeddedFonts(svg: string): string {
  assertPrintableSvg(svg);
  const faces = facesUsed(svg);
  if (!faces.length) return svg;
  const rules = faces.map(({ family, face }) => {
    const data = fs.readFileSync(fontPath(family, face)).toString("base64");
    const weight = face === "bold" ? "bold" : "normal";
    const style = face === "italic" ? "italic" : "normal";
    return `@font-face{font-family:"${family}";font-weight:${weight};font-style:${style};src:url(data:font/ttf;base64,${data}) format("truetype")}`;
  });
  return svg.replace(/^(\s*<svg\b[^>]*>)/, `$1<defs><style>${rules.join("")}</style></defs>`);
}

export function svgForExport(svg: string, text: SvgText): string {
  return text === "embedded" ? svgWithEmbeddedFonts(svg) : svgTextAsOutlines(svg);
}
