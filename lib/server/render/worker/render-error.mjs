/**
 * The render error and the unit helpers shared by the renderer, the worker and the exporters.
 * No Vega imports, so PNG/PDF export and composition do not pull Vega into the server bundle.
 */

export const PT_PER_MM = 72 / 25.4;

export class RenderError extends Error {
  /** @param {string} code @param {string} message */
  constructor(code, message) {
    super(message);
    this.name = "RenderError";
    this.code = code;
  }
}

/** width/height of the root <svg> element, in user units (from its viewBox when present). */
export function rootSize(svg) {
  const root = /^\s*<svg\b[^>]*>/.exec(svg)?.[0] ?? "";
  const vb = /viewBox="([^"]+)"/
    .exec(root)?.[1]
    ?.trim()
    .split(/[\s,]+/)
    .map(Number);
  if (vb?.length === 4 && vb.every(Number.isFinite)) return { width: vb[2], height: vb[3] };
  const width = Number(/\swidth="([\d.]+)(?:px|pt)?"/.exec(root)?.[1]);
  const height = Number(/\sheight="([\d.]+)(?:px|pt)?"/.exec(root)?.[1]);
  return { width, height };
}
