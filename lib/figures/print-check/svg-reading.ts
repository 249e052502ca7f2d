/** The texts (with their printed sizes) and the data colours of the composed figure SVG. */
import { PT_PER_MM } from "./types";

export interface SvgText {
  /** Panel letter from the composer's `<g class="panel panel-b">`, null outside a panel. */
  panel: string | null;
  text: string;
  /** Printed size, pt. */
  pt: number;
}

export interface SvgMarkColours {
  panel: string;
  /** Distinct colours (as written) of one data mark group. */
  colours: string[];
  /** A fill from a gradient (a colour bar or gradient mark). */
  gradient: boolean;
}

interface Frame {
  tag: string;
  scale: number;
  fontSize: number;
  panel: string | null;
  /** Inside a `role-mark` group of a data mark kind: its colour set. */
  marks: SvgMarkColours | null;
}

const attr = (attrs: string, name: string): string | null => {
  const m = new RegExp(`(?:^|\\s)${name}\\s*=\\s*(?:"([^"]*)"|'([^']*)')`).exec(attrs);
  return m ? (m[1] ?? m[2] ?? null) : null;
};
const styleProp = (attrs: string, name: string): string | null => {
  const style = attr(attrs, "style");
  if (!style) return null;
  const m = new RegExp(`(?:^|;)\\s*${name}\\s*:\\s*([^;]+)`).exec(style);
  return m ? m[1].trim() : null;
};
const prop = (attrs: string, name: string) => styleProp(attrs, name) ?? attr(attrs, name);

/** A length in user units (px and bare numbers; pt as CSS reads it, 4/3 px). */
function userLength(v: string | null, em: number): number | null {
  if (v === null) return null;
  const m = /^\s*(-?[\d.]+(?:e[-+]?\d+)?)\s*(px|pt|em|%)?\s*$/i.exec(v);
  if (!m) return null;
  const n = Number(m[1]);
  const unit = (m[2] ?? "").toLowerCase();
  if (unit === "pt") return (n * 4) / 3;
  if (unit === "em") return n * em;
  if (unit === "%") return (n / 100) * em;
  return n;
}

/** Area scale of an SVG transform list (√|det| of each function's linear part, multiplied). */
export function transformScale(transform: string | null): number {
  if (!transform) return 1;
  let k = 1;
  for (const m of transform.matchAll(/(\w+)\s*\(([^)]*)\)/g)) {
    const args = m[2]
      .split(/[\s,]+/)
      .filter(Boolean)
      .map(Number);
    if (m[1] === "scale") k *= Math.sqrt(Math.abs(args[0] * (args[1] ?? args[0])));
    else if (m[1] === "matrix" && args.length === 6) k *= Math.sqrt(Math.abs(args[0] * args[3] - args[1] * args[2]));
  }
  return k;
}

const DATA_MARKS = /\bmark-(symbol|line|area|rect|trail|arc|shape|path)\b/;
const decode = (s: string) =>
  s.replace(/&(lt|gt|amp|quot|apos|#\d+|#x[0-9a-f]+);/gi, (_, e: string) =>
    e[0] === "#"
      ? String.fromCodePoint(e[1].toLowerCase() === "x" ? parseInt(e.slice(2), 16) : Number(e.slice(1)))
      : ({ lt: "<", gt: ">", amp: "&", quot: '"', apos: "'" } as Record<string, string>)[e.toLowerCase()],
  );

/**
 * Every text of a composed figure SVG with its printed size in pt, and the colours of each panel's
 * data marks. Reads the SVG the composer writes (lib/server/render/worker/compose-core.mjs): a root in mm
 * with a viewBox in pt, one `<g class="panel panel-x">` per panel holding a nested `<svg>` scaled to its cell.
 */
export function readFigureSvg(svg: string): { texts: SvgText[]; marks: SvgMarkColours[] } {
  const texts: SvgText[] = [];
  const marks: SvgMarkColours[] = [];
  const stack: Frame[] = [];
  let text: { frame: Frame; content: string } | null = null;
  for (const m of svg.matchAll(/<(\/?)([a-zA-Z][\w:-]*)((?:[^>"']|"[^"]*"|'[^']*')*?)(\/?)>|([^<]+)/g)) {
    if (m[5] !== undefined) {
      if (text) text.content += m[5];
      continue;
    }
    const [, closing, tag, attrs, selfClosing] = m;
    if (closing) {
      const frame = stack.pop();
      if (frame && text && text.frame === frame) {
        const content = decode(text.content).replace(/\s+/g, " ").trim();
        if (content) texts.push({ panel: frame.panel, text: content, pt: frame.fontSize * frame.scale });
        text = null;
      }
      continue;
    }
    const parent = stack.at(-1) ?? { tag: "", scale: 1, fontSize: 16, panel: null, marks: null };
    let scale = parent.scale * transformScale(attr(attrs, "transform"));
    if (tag === "svg") {
      const box = attr(attrs, "viewBox")
        ?.split(/[\s,]+/)
        .map(Number);
      const w = attr(attrs, "width");
      const h = attr(attrs, "height");
      if (!stack.length) {
        // The root: width in mm (or pt), viewBox in pt-sized user units.
        const mm = w && /mm\s*$/.test(w) ? parseFloat(w) * PT_PER_MM : w ? userLength(w, 16) : null;
        if (box && box.length === 4 && mm && box[2] > 0) scale = mm / box[2];
      } else if (box && box.length === 4 && box[2] > 0 && box[3] > 0) {
        const kx = (userLength(w, parent.fontSize) ?? box[2]) / box[2];
        const ky = (userLength(h, parent.fontSize) ?? box[3]) / box[3];
        scale *= Math.min(kx, ky);
      }
    }
    const fontSize = userLength(prop(attrs, "font-size"), parent.fontSize) ?? parent.fontSize;
    const cls = attr(attrs, "class") ?? "";
    const panelClass = tag === "g" ? /(?:^|\s)panel-(\S+)/.exec(cls) : null;
    const panel = panelClass ? panelClass[1] : parent.panel;
    let group = parent.marks;
    if (tag === "g" && /\brole-mark\b/.test(cls) && panel) {
      group = DATA_MARKS.test(cls) ? { panel, colours: [], gradient: false } : null;
      if (group) marks.push(group);
    } else if (tag === "g" && /\brole-/.test(cls)) group = null;
    if (group && tag !== "g") {
      const opacity = Number(prop(attrs, "opacity") ?? 1);
      for (const paint of ["fill", "stroke"] as const) {
        const v = prop(attrs, paint);
        const paintOpacity = Number(prop(attrs, `${paint}-opacity`) ?? 1);
        if (!v || v === "none" || opacity === 0 || paintOpacity === 0) continue;
        if (paint === "stroke" && Number(prop(attrs, "stroke-width") ?? 1) === 0) continue;
        if (v.startsWith("url(")) group.gradient = true;
        else if (!group.colours.includes(v)) group.colours.push(v);
      }
    }
    const frame: Frame = { tag, scale, fontSize, panel, marks: group };
    if (selfClosing) continue;
    stack.push(frame);
    if (tag === "text") text = { frame, content: "" };
  }
  return { texts, marks };
}
