/**
 * Browser rendering helpers for panel specs: a loader that refuses every load, the print-size
 * sizing the server renderer uses (spec units are points), the shipped font, and the geometry
 * of the first plot so review anchors can be placed in data coordinates.
 */
import type { Loader, View } from "vega";
import { loader as vegaLoader } from "vega";
import { formatPath } from "@/lib/figures/spec-path";
import { checkSpecSecurity } from "@/lib/figures/spec-security";

const PT_PER_MM = 72 / 25.4;
export const PX_PER_MM = 96 / 25.4;
const COMPOSITE_KEYS = ["vconcat", "hconcat", "concat", "facet", "repeat"];

type Json = { [key: string]: unknown };

/** Every entry point refuses and the request is remembered, so the render can fail visibly. */
export function refusingLoader(refusals: string[]): Loader {
  const l = vegaLoader();
  const refuse =
    (what: string) =>
    (uri: unknown): Promise<never> => {
      refusals.push(`${what}: ${typeof uri === "string" ? uri : JSON.stringify(uri)}`);
      return Promise.reject(new Error("Prooflight renders bound data only; loading is disabled"));
    };
  Object.assign(l, { load: refuse("load"), sanitize: refuse("sanitize"), http: refuse("http"), file: refuse("file") });
  return l;
}

const isComposite = (spec: Json) => COMPOSITE_KEYS.some((k) => k in spec);

/** The family the app ships Inter under (next/font gives it a private name). */
export function shippedFontFamily(): string {
  if (typeof document === "undefined") return "Inter, sans-serif";
  const v = getComputedStyle(document.documentElement).getPropertyValue("--font-inter").trim();
  return v ? `${v}, Inter, sans-serif` : "Inter, sans-serif";
}

function swapFonts(node: unknown, family: string): unknown {
  if (Array.isArray(node)) return node.map((n) => swapFonts(n, family));
  if (!node || typeof node !== "object") return node;
  const out: Json = {};
  for (const [k, v] of Object.entries(node)) out[k] = /font$/i.test(k) && v === "Inter" ? family : swapFonts(v, family);
  return out;
}

/**
 * The client-side budget: the same pure rules the server validates with (stored revisions may
 * predate a rule). Returns the first problem as "path: message", or null when the spec may be drawn.
 */
export function refusalOf(spec: Json): string | null {
  const first = checkSpecSecurity(spec).issues[0];
  return first ? `${formatPath(first.path)}: ${first.message}` : null;
}

/**
 * The spec as the browser renders it: like the server, single views are sized to the printed
 * width in points with autosize "fit"; composites keep their sizes and are scaled to the width.
 * `usermeta` is dropped: vega-embed merges `usermeta.embedOptions` over the options we pass, and
 * display options are Prooflight's, never the spec author's.
 */
export function prepareSpec(spec: Json, widthMm: number, family: string): Json {
  // As in exports: numbers without thousands separators unless the spec chooses a format.
  const config = swapFonts({ numberFormat: "~f", ...(spec.config ?? {}), font: "Inter" }, family) as Json;
  const base: Json = { ...spec, config };
  delete base.usermeta;
  if (isComposite(spec)) return base;
  return { ...base, width: Math.round(widthMm * PT_PER_MM * 100) / 100, autosize: { type: "fit", contains: "padding" } };
}

/** Names the spec reads from bound data (`{ "name": … }` sources not defined in `datasets`). */
export function dataNamesOf(spec: unknown): string[] {
  const out = new Set<string>();
  const walk = (node: unknown) => {
    if (Array.isArray(node)) return node.forEach(walk);
    if (!node || typeof node !== "object") return;
    for (const [k, v] of Object.entries(node)) {
      if (k === "usermeta" || k === "datasets" || k === "values") continue;
      if (k === "data" && v && typeof v === "object" && typeof (v as Json).name === "string" && !("values" in v) && !("url" in v))
        out.add((v as Json).name as string);
      walk(v);
    }
  };
  walk(spec);
  const defined = spec && typeof spec === "object" && (spec as Json).datasets ? Object.keys((spec as Json).datasets as Json) : [];
  return [...out].filter((n) => !defined.includes(n));
}

/** A continuous scale: data → plot units, and back. */
type PlotScale = ((v: number) => number) & { invert(px: number): number };

export interface PlotGeometry {
  /** Plot area in the rendered SVG's own units. */
  left: number;
  top: number;
  width: number;
  height: number;
  x: PlotScale | null;
  y: PlotScale | null;
}

interface SceneItem {
  x?: number;
  y?: number;
  width?: number;
  height?: number;
  items?: SceneMark[];
}
interface SceneMark {
  name?: string;
  marktype?: string;
  items?: SceneItem[];
}

function findGroup(mark: SceneMark, name: string, ox: number, oy: number): { x: number; y: number; item: SceneItem } | null {
  for (const item of mark.items ?? []) {
    const x = ox + (item.x ?? 0),
      y = oy + (item.y ?? 0);
    if (mark.name === name) return { x, y, item };
    for (const child of item.items ?? []) {
      const found = child.marktype === "group" ? findGroup(child, name, x, y) : null;
      if (found) return found;
    }
  }
  return null;
}

/** The x/y scales of the first unit view (for stacked specs, the top plot) and where its plot area is. */
export function plotGeometry(view: View): PlotGeometry | null {
  const names = Object.keys((view as unknown as { _runtime?: { scales?: Json } })._runtime?.scales ?? {});
  const pick = (axis: "x" | "y") => (names.includes(axis) ? axis : (names.find((n) => n.endsWith(`_${axis}`)) ?? null));
  const xName = pick("x"),
    yName = pick("y");
  if (!xName && !yName) return null;
  const safeScale = (n: string | null): PlotScale | null => {
    if (!n) return null;
    try {
      const s = view.scale(n) as unknown as PlotScale | undefined;
      return typeof s === "function" && typeof (s as { invert?: unknown }).invert === "function" ? s : null;
    } catch {
      return null;
    }
  };
  // The renderer translates the scene by the view's origin (padding plus room for axes).
  const [ox, oy] = view.origin();
  const root = (view.scenegraph() as unknown as { root: SceneMark }).root;
  const rootItem = root.items?.[0];
  let rect = { left: ox + (rootItem?.x ?? 0), top: oy + (rootItem?.y ?? 0), width: view.width(), height: view.height() };
  const prefix = (yName ?? xName ?? "").replace(/[xy]$/, "");
  if (prefix) {
    const g = findGroup(root, `${prefix}group`, ox, oy);
    if (g) rect = { left: g.x, top: g.y, width: g.item.width ?? 0, height: g.item.height ?? 0 };
  }
  return { ...rect, x: safeScale(xName), y: safeScale(yName) };
}

/** Natural size of the rendered SVG (its viewBox, in spec units). */
export function svgNaturalSize(svg: SVGSVGElement): { width: number; height: number } {
  const vb = svg.viewBox?.baseVal;
  if (vb && vb.width > 0) return { width: vb.width, height: vb.height };
  return { width: Number(svg.getAttribute("width")) || 1, height: Number(svg.getAttribute("height")) || 1 };
}

interface SceneNode {
  marktype?: string;
  role?: string;
  items?: Array<{ items?: SceneNode[] }>;
}

/**
 * Items in the data marks of a rendered view (Vega role "mark", not groups, axes, legends or
 * titles); null when the view has no data mark at all. 0 means the plot drew nothing.
 */
export function dataMarkItems(view: View): number | null {
  let marks = 0,
    items = 0;
  const walk = (node: SceneNode | undefined) => {
    if (!node) return;
    if (node.marktype === "group") {
      for (const item of node.items ?? []) for (const child of item.items ?? []) walk(child);
    } else if (node.role === "mark") {
      marks++;
      items += node.items?.length ?? 0;
    }
  };
  walk((view.scenegraph() as unknown as { root?: SceneNode }).root);
  return marks ? items : null;
}
