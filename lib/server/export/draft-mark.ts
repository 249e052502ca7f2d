import "server-only";
import { svgSizeMm } from "../render/svg-safety";
import { PT_PER_MM } from "../render/worker/render-error.mjs";

/** What an export of a figure that is not signed off on its current hash says about itself. */
export const DRAFT_MARK_TEXT = "Not signed off — draft for review";

const STRIP_MM = 3;

/**
 * Adds a 3 mm strip under the composed figure with the draft mark and the figure hash, so a
 * printed or pasted copy still says it was not signed off. The plot area is not touched.
 */
export function withDraftMark(svg: string, figureHash: string): string {
  const { widthMm, heightMm } = svgSizeMm(svg);
  const root = /<svg\b[^>]*>/.exec(svg)![0];
  const [, , vbW, vbH] = (/\sviewBox="([^"]+)"/.exec(root)?.[1] ?? `0 0 ${widthMm * PT_PER_MM} ${heightMm * PT_PER_MM}`).split(/\s+/).map(Number);
  const strip = (STRIP_MM / heightMm) * vbH;
  const newRoot = root
    .replace(/\sheight="[\d.]+mm"/, ` height="${(heightMm + STRIP_MM).toFixed(3)}mm"`)
    .replace(/\sviewBox="[^"]+"/, ` viewBox="0 0 ${vbW} ${(vbH + strip).toFixed(3)}"`);
  const y = vbH + strip * 0.75;
  const mark =
    `<rect x="0" y="${vbH}" width="${vbW}" height="${strip.toFixed(3)}" fill="white"/>` +
    `<text x="2" y="${y.toFixed(3)}" font-family="Inter" font-size="${(strip * 0.6).toFixed(3)}" fill="#a32a00">` +
    `${DRAFT_MARK_TEXT} · figure hash ${figureHash.slice(0, 12)}</text>`;
  return svg.replace(root, newRoot).replace(/<\/svg>\s*$/, `${mark}</svg>`);
}
