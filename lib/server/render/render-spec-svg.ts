/**
 * Server rendering of one panel: Vega-Lite → Vega → SVG at the printed size, in this process.
 * The implementation lives in ./worker/render-core.mjs so the render worker can load it without
 * a TypeScript build; exports should go through ./render-in-worker (time and memory budget).
 */
import "server-only";
import { RenderError, renderSpecToSvgCore, type BoundData, type PhysicalSize, type RenderedSvg } from "./worker/render-core.mjs";

export { PT_PER_MM, RenderError, type BoundData, type PhysicalSize, type RenderedSvg } from "./worker/render-core.mjs";

/**
 * Renders `spec` with `data` (rows per bound data name) at `widthMm` (and `heightMm` if given).
 * The SVG's root has width/height in mm and a viewBox in pt. Throws RenderError: invalid-spec,
 * missing-data, load-refused (the spec tried to load a URL or file), render-failed, bad-size.
 * Specs should already have passed validateSpec; this is the second line of defence.
 */
export async function renderSpecToSvg(spec: unknown, data: BoundData, size: PhysicalSize): Promise<RenderedSvg> {
  try {
    return await renderSpecToSvgCore(spec, data, size);
  } catch (err) {
    if (err instanceof RenderError) throw err;
    throw new RenderError("render-failed", (err as Error)?.message ?? String(err));
  }
}
