/**
 * Vega-Lite → SVG at physical size. Plain JavaScript (typed by render-core.d.mts) because the
 * render worker loads it directly with Node, in tests and in the Next.js production server alike.
 *
 * Safety: the loader refuses every load (recorded, then the render fails), expressions are
 * evaluated without code generation (./expression-compiler.mjs: vega-interpreter's semantics and
 * checks, closures built once per expression), and the caller runs this in a worker process with
 * a time and memory budget. Units: SVG user units are points (1 mm = 72/25.4 pt); the root
 * element carries the physical size in mm and a viewBox in pt.
 */
import * as vega from "vega";
import { compile } from "vega-lite";
import { compiledExpressions } from "./expression-compiler.mjs";
import { PT_PER_MM, RenderError, rootSize } from "./render-error.mjs";

export { PT_PER_MM, RenderError, rootSize } from "./render-error.mjs";

const COMPOSITE_KEYS = ["vconcat", "hconcat", "concat", "facet", "repeat"];

/** A Vega loader whose every entry point refuses, remembering what was asked for. */
export function refusingLoader(refusals) {
  const loader = vega.loader();
  const refuse = (what) => async (uri) => {
    refusals.push(`${what}: ${typeof uri === "string" ? uri : JSON.stringify(uri)}`);
    throw new Error("Prooflight renders bound data only; loading is disabled");
  };
  loader.load = refuse("load");
  loader.sanitize = refuse("sanitize");
  loader.http = refuse("http");
  loader.file = refuse("file");
  return loader;
}

function collectingLogger(messages) {
  let level = 2;
  const logger = {
    level(l) {
      if (l === undefined) return level;
      level = l;
      return logger;
    },
    error(...args) {
      messages.push(args.map(String).join(" "));
      return logger;
    },
    warn(...args) {
      messages.push(args.map(String).join(" "));
      return logger;
    },
    info() {
      return logger;
    },
    debug() {
      return logger;
    },
  };
  return logger;
}

const isSpecNode = (o) => o && typeof o === "object" && !Array.isArray(o) && ["mark", "layer", "spec", ...COMPOSITE_KEYS].some((k) => k in o);

/** Vega-Lite's size of a continuous view that sets none (config.view), pt. */
const DEFAULT_CONTINUOUS = 300;

/**
 * Copies a Vega-Lite spec with every view's numeric width/height multiplied (composite specs),
 * including the default size of views that set none (config.view.continuousWidth/Height).
 */
function scaleViewSizes(spec, kx, ky) {
  const view = spec.config?.view ?? {};
  const scaled = scaleNode(spec, kx, ky);
  scaled.config = {
    ...(spec.config ?? {}),
    view: {
      ...view,
      continuousWidth: (view.continuousWidth ?? DEFAULT_CONTINUOUS) * kx,
      continuousHeight: (view.continuousHeight ?? DEFAULT_CONTINUOUS) * ky,
    },
  };
  return scaled;
}

function scaleNode(node, kx, ky) {
  if (Array.isArray(node)) return node.map((n) => scaleNode(n, kx, ky));
  if (!node || typeof node !== "object") return node;
  const out = {};
  for (const [k, v] of Object.entries(node)) {
    if (k === "config" || k === "data" || k === "datasets" || k === "usermeta" || k === "encoding" || k === "mark" || k === "transform") out[k] = v;
    else if (k === "width" && typeof v === "number" && isSpecNode(node)) out[k] = v * kx;
    else if (k === "height" && typeof v === "number" && isSpecNode(node)) out[k] = v * ky;
    else out[k] = scaleNode(v, kx, ky);
  }
  return out;
}

/** The faces the renderers ship (system fonts are never used). */
const FONTS = new Set(["Inter", "Arimo"]);

/**
 * Inter for all text unless the spec's config names another shipped face (the house style sets
 * it); ARIA attributes off unless the spec asks for them (a print file has no reader for them,
 * and per-mark descriptions double the SVG of a dense panel).
 */
function withPrintConfig(spec) {
  const config = spec.config ?? {};
  return { ...spec, config: { aria: false, ...config, font: FONTS.has(config.font) ? config.font : "Inter" } };
}

/** Vega-Lite's padding when neither the spec nor its config sets one, pt. */
const DEFAULT_PADDING = 5;

/**
 * Adds room on the left, top or bottom (pt) to the spec's padding, which moves the plotting area
 * in by that much (used to line up axes across a figure's panels).
 */
function withExtraPadding(spec, extra) {
  if (!extra || !(extra.left || extra.top || extra.bottom)) return spec;
  const own = spec.padding ?? spec.config?.padding ?? DEFAULT_PADDING;
  const side = (k) => (typeof own === "number" ? own : Number.isFinite(own?.[k]) ? own[k] : DEFAULT_PADDING);
  const padding = {
    left: side("left") + (extra.left ?? 0),
    top: side("top") + (extra.top ?? 0),
    right: side("right"),
    bottom: side("bottom") + (extra.bottom ?? 0),
  };
  return { ...spec, padding };
}

/** Names the Vega-Lite spec reads from bound data: `{ "name": … }` sources not defined in `datasets`. */
export function boundDataNames(vlSpec) {
  const out = new Set();
  const walk = (node) => {
    if (Array.isArray(node)) return node.forEach(walk);
    if (!node || typeof node !== "object") return;
    for (const [k, v] of Object.entries(node)) {
      if (k === "usermeta" || k === "datasets" || k === "values") continue;
      if (k === "data" && v && typeof v === "object" && typeof v.name === "string" && !("values" in v) && !("url" in v) && !("sequence" in v)) out.add(v.name);
      walk(v);
    }
  };
  walk(vlSpec);
  const defined = vlSpec.datasets && typeof vlSpec.datasets === "object" ? Object.keys(vlSpec.datasets) : [];
  return [...out].filter((n) => !defined.includes(n));
}

/** One Vega render of a Vega-Lite spec: SVG text and its natural size in user units. */
export async function renderOnce(vlSpec, data, { warnings = [], refusals = [] } = {}) {
  let vgSpec;
  try {
    // Journal default under the spec's own config: numbers without thousands separators ("2700", not
    // "2,700"), precision still chosen from the tick step; a spec's config or axis format wins.
    vgSpec = compile(vlSpec, { config: { numberFormat: "~f" }, logger: collectingLogger(warnings) }).spec;
  } catch (err) {
    throw new RenderError("invalid-spec", `Vega-Lite could not compile the spec: ${err?.message ?? err}`);
  }
  const names = boundDataNames(vlSpec);
  const missing = names.filter((n) => !Array.isArray(data?.[n]));
  if (missing.length) throw new RenderError("missing-data", `no rows are bound to ${missing.map((n) => `"${n}"`).join(", ")}`);
  let view;
  try {
    const runtime = vega.parse(vgSpec, undefined, { ast: true });
    view = new vega.View(runtime, {
      renderer: "none",
      loader: refusingLoader(refusals),
      expr: compiledExpressions,
      logger: collectingLogger(warnings),
    });
    for (const n of names) view.data(n, data[n]);
    await view.runAsync();
    if (refusals.length) throw refused(refusals);
    const svg = normaliseIds(await view.toSVG());
    if (refusals.length) throw refused(refusals);
    const size = rootSize(svg);
    return { svg, width: size.width, height: size.height, warnings, plot: plotMargins(view, size) };
  } catch (err) {
    if (err instanceof RenderError) throw err;
    if (refusals.length) throw refused(refusals);
    throw new RenderError("render-failed", `Vega could not render the spec: ${err?.message ?? err}`);
  } finally {
    view?.finalize();
  }
}

/**
 * Where the plotting area sits inside the rendered panel: its distance from each edge, pt. The
 * plot is the union of the views' data rectangles (the root frame of a single view, each scope
 * of a concat or facet), found in Vega's scenegraph. Null when there is none.
 */
function plotMargins(view, size) {
  // The drawing is translated by the padding, then by the origin (room for axes and titles).
  const [ox0, oy0] = view.origin();
  const pad = view.padding();
  const ox = ox0 + (pad?.left ?? 0);
  const oy = oy0 + (pad?.top ?? 0);
  let box = null;
  const walk = (mark, x0, y0) => {
    if (mark.marktype !== "group") return;
    for (const item of mark.items ?? []) {
      const x = x0 + (item.x ?? 0);
      const y = y0 + (item.y ?? 0);
      if ((mark.role === "frame" || mark.role === "scope") && item.width > 0 && item.height > 0) {
        box = box
          ? {
              left: Math.min(box.left, x),
              top: Math.min(box.top, y),
              right: Math.max(box.right, x + item.width),
              bottom: Math.max(box.bottom, y + item.height),
            }
          : { left: x, top: y, right: x + item.width, bottom: y + item.height };
      }
      for (const child of item.items ?? []) walk(child, x, y);
    }
  };
  walk(view.scenegraph().root, ox, oy);
  return box && { left: box.left, top: box.top, right: size.width - box.right, bottom: size.height - box.bottom };
}

function refused(refusals) {
  return new RenderError("load-refused", `the spec tried to load external resources, which is not allowed (${refusals.slice(0, 3).join("; ")})`);
}

const fmt = (v) => String(Math.round(v * 1000) / 1000);

/**
 * Vega numbers gradient and clip ids from a process-wide counter, so the same panel would get
 * different ids on each render. Renumbers them in order of appearance (gradient_0, clip1 → clip0)
 * so an export is byte-for-byte the same every time.
 */
export function normaliseIds(svg) {
  const map = new Map();
  const counters = new Map();
  for (const m of svg.matchAll(/\sid="([^"]+)"/g)) {
    const id = m[1];
    if (map.has(id)) continue;
    const base = id.replace(/\d+$/, "");
    const n = counters.get(base) ?? 0;
    counters.set(base, n + 1);
    map.set(id, `${base}${n}`);
  }
  if (!map.size) return svg;
  return svg
    .replace(/(\sid=")([^"]+)"/g, (_, a, id) => `${a}${map.get(id) ?? id}"`)
    .replace(/url\(\s*#([^)\s]+)\s*\)/g, (m, id) => (map.has(id) ? `url(#${map.get(id)})` : m))
    .replace(/((?:xlink:)?href=")#([^"]+)"/g, (m, a, id) => (map.has(id) ? `${a}#${map.get(id)}"` : m));
}

/** Sets the root element's physical size (mm) and a viewBox of the natural size in pt. */
export function setPhysicalSize(svg, width, height, widthMm, heightMm) {
  return svg.replace(/^\s*<svg\b[^>]*>/, (root) => {
    const rest = root
      .replace(/\s(?:width|height|viewBox)="[^"]*"/g, "")
      .replace(/^<svg/, "")
      .replace(/>$/, "");
    return `<svg${rest} width="${fmt(widthMm)}mm" height="${fmt(heightMm)}mm" viewBox="0 0 ${fmt(width)} ${fmt(height)}">`;
  });
}

function checkSize(widthMm, heightMm) {
  if (!Number.isFinite(widthMm) || widthMm < 10 || widthMm > 1000) throw new RenderError("bad-size", "widthMm must be between 10 and 1000");
  if (heightMm !== undefined && (!Number.isFinite(heightMm) || heightMm < 10 || heightMm > 1000)) {
    throw new RenderError("bad-size", "heightMm must be between 10 and 1000");
  }
}

/**
 * Renders a Vega-Lite spec with bound data at a physical width (and optionally height).
 * Single and layered views are sized exactly with autosize "fit"; composite views (concat,
 * facet, repeat) are resized by scaling their view sizes (up to three renders), and any
 * remaining difference is absorbed by the viewBox.
 */
export async function renderSpecToSvgCore(spec, data, { widthMm, heightMm } = {}, extraPadding) {
  if (!spec || typeof spec !== "object" || Array.isArray(spec)) throw new RenderError("invalid-spec", "a spec must be a JSON object");
  checkSize(widthMm, heightMm);
  const targetW = widthMm * PT_PER_MM;
  const targetH = heightMm === undefined ? undefined : heightMm * PT_PER_MM;
  const warnings = [];
  const base = withExtraPadding(withPrintConfig(spec), extraPadding);
  let out;
  if (!COMPOSITE_KEYS.some((k) => k in spec)) {
    const sized = { ...base, width: targetW, autosize: { type: "fit", contains: "padding" } };
    if (targetH !== undefined) sized.height = targetH;
    out = await renderOnce(sized, data, { warnings });
  } else {
    out = await fitComposite(base, data, targetW, targetH, warnings);
  }
  const physicalHeightMm = heightMm ?? (out.height * widthMm) / out.width;
  return {
    plot: out.plot,
    svg: setPhysicalSize(out.svg, out.width, out.height, widthMm, physicalHeightMm),
    widthPx: out.width,
    heightPx: out.height,
    widthMm,
    heightMm: physicalHeightMm,
    warnings: [...new Set(warnings)],
  };
}

async function fitComposite(base, data, targetW, targetH, warnings) {
  const render = (kx, ky) => renderOnce(scaleViewSizes(base, kx, ky), data, { warnings });
  let k = [1, 1];
  let r = await render(1, 1);
  const close = (x) => Math.abs(x.width - targetW) < 0.5 && (targetH === undefined || Math.abs(x.height - targetH) < 0.5);
  let prev = null;
  for (let i = 0; i < 2 && !close(r); i++) {
    const next = [
      secant(prev?.k[0], prev?.r.width, k[0], r.width, targetW),
      targetH === undefined ? 1 : secant(prev?.k[1], prev?.r.height, k[1], r.height, targetH),
    ];
    prev = { k, r };
    k = next;
    r = await render(k[0], k[1]);
  }
  return r;
}

/** Next guess of a size factor: proportional from one point, secant from two. */
function secant(k0, v0, k1, v1, target) {
  const guess = k0 === undefined || v1 === v0 ? (k1 * target) / v1 : k1 + ((target - v1) * (k1 - k0)) / (v1 - v0);
  return Number.isFinite(guess) && guess > 0.05 ? Math.min(guess, 20) : k1;
}
