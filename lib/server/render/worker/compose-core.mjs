/**
 * Places rendered panel SVGs on a grid as one figure: nested <svg> elements positioned in pt,
 * each panel's letter above its top-left corner (bold 8 pt Inter unless the layout's house style
 * says otherwise), the root sized in mm.
 * Plain JavaScript (typed by compose-core.d.mts) so the render worker can load it.
 */
import { PT_PER_MM, RenderError, rootSize } from "./render-error.mjs";

export { gridPlacement } from "../../../figures/grid-placement.mjs";

const DEFAULT_GAP_MM = 2;
const DEFAULT_LETTER_BAND_MM = 3;
const LETTER_PT = 8;
/** The faces the renderers ship; any other family falls back to Inter. */
const FONTS = new Set(["Inter", "Arimo"]);

const fmt = (v) => String(Math.round(v * 1000) / 1000);
const escapeXml = (s) => String(s).replace(/[<>&"']/g, (c) => ({ "<": "&lt;", ">": "&gt;", "&": "&amp;", '"': "&quot;", "'": "&apos;" })[c]);

/** Width in mm of a panel spanning `span` of `columns` columns, so panels can be rendered at their printed size. */
export function cellWidthMm(widthMm, columns, span = 1, gapMm = DEFAULT_GAP_MM) {
  const cols = Math.max(1, Math.floor(columns));
  const s = Math.min(cols, Math.max(1, Math.floor(span)));
  const cell = (widthMm - (cols - 1) * gapMm) / cols;
  return s * cell + (s - 1) * gapMm;
}

/** Prefixes every id (and the references to it) so several panels' clip paths cannot collide. */
export function prefixIds(svg, prefix) {
  const ids = [...svg.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
  if (!ids.length) return svg;
  const known = new Set(ids);
  return svg
    .replace(/(\sid=")([^"]+)"/g, (_, a, id) => `${a}${prefix}${id}"`)
    .replace(/url\(\s*#([^)\s]+)\s*\)/g, (m, id) => (known.has(id) ? `url(#${prefix}${id})` : m))
    .replace(/((?:xlink:)?href=")#([^"]+)"/g, (m, a, id) => (known.has(id) ? `${a}#${prefix}${id}"` : m));
}

/** The panel's content as a nested <svg> at (x, y) with the given size in the parent's units. */
function nestPanel(svg, x, y, width, height, naturalW, naturalH) {
  const open = /^\s*<svg\b[^>]*>/.exec(svg);
  const close = svg.lastIndexOf("</svg>");
  if (!open || close < 0) throw new RenderError("render-failed", "a panel is not an SVG document");
  const inner = svg.slice(open[0].length, close);
  return `<svg x="${fmt(x)}" y="${fmt(y)}" width="${fmt(width)}" height="${fmt(height)}" viewBox="0 0 ${fmt(naturalW)} ${fmt(naturalH)}" preserveAspectRatio="xMinYMin meet" overflow="hidden">${inner}</svg>`;
}

/**
 * Lays panels out row by row (a panel that does not fit in the rest of a row starts the next),
 * scaling each to its cell width. Returns the SVG and its physical size.
 */
export function composeFigureCore(panels, layout, widthMm) {
  if (!Number.isFinite(widthMm) || widthMm < 10 || widthMm > 1000) throw new RenderError("bad-size", "widthMm must be between 10 and 1000");
  const columns = Math.max(1, Math.floor(layout?.columns ?? 1));
  const gapMm = layout?.gapMm ?? DEFAULT_GAP_MM;
  const gap = gapMm * PT_PER_MM;
  const band = (layout?.letterBandMm ?? DEFAULT_LETTER_BAND_MM) * PT_PER_MM;
  const totalW = widthMm * PT_PER_MM;
  const letterFont = FONTS.has(layout?.letterFont) ? layout.letterFont : "Inter";
  const letterPt = Number.isFinite(layout?.letterPt) ? Math.min(14, Math.max(6, layout.letterPt)) : LETTER_PT;
  const letterWeight = layout?.letterWeight === "normal" ? "normal" : "bold";
  const cellW = (totalW - (columns - 1) * gap) / columns;

  const placed = [];
  let col = 0;
  let rowTop = 0;
  let rowHeight = 0;
  for (const panel of panels) {
    const span = Math.min(columns, Math.max(1, Math.floor(panel.span ?? 1)));
    if (col + span > columns) {
      rowTop += band + rowHeight + gap;
      col = 0;
      rowHeight = 0;
    }
    const natural = panel.widthPx && panel.heightPx ? { width: panel.widthPx, height: panel.heightPx } : rootSize(panel.svg);
    if (!(natural.width > 0 && natural.height > 0)) throw new RenderError("render-failed", `panel ${panel.letter} has no size`);
    const w = span * cellW + (span - 1) * gap;
    const h = (natural.height * w) / natural.width;
    const x = col * (cellW + gap);
    placed.push({ panel, x, y: rowTop, w, h, natural });
    rowHeight = Math.max(rowHeight, h);
    col += span;
  }
  const totalH = panels.length ? rowTop + band + rowHeight : band;

  const parts = placed.map(({ panel, x, y, w, h, natural }) => {
    const id = `p${String(panel.letter).replace(/[^A-Za-z0-9]/g, "")}-`;
    const body = nestPanel(prefixIds(panel.svg, id), x, y + band, w, h, natural.width, natural.height);
    const letter = `<text x="${fmt(x)}" y="${fmt(y + band - 1.5)}" font-family="${letterFont}" font-weight="${letterWeight}" font-size="${fmt(letterPt)}" fill="#000000">${escapeXml(panel.letter)}</text>`;
    return `<g class="panel panel-${escapeXml(panel.letter)}">${letter}${body}</g>`;
  });
  const heightMm = totalH / PT_PER_MM;
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" version="1.1" width="${fmt(widthMm)}mm" height="${fmt(heightMm)}mm" viewBox="0 0 ${fmt(totalW)} ${fmt(totalH)}"><rect width="${fmt(totalW)}" height="${fmt(totalH)}" fill="white"/>${parts.join("")}</svg>`;
  return { svg, widthMm, heightMm, widthPx: totalW, heightPx: totalH };
}
