/**
 * What changed between two revisions of a panel, in words: a structural comparison of the two specs
 * and of the data each name is bound to, one sentence per change.
 *
 * The common Vega-Lite places get plain names (`encoding.y.title` → "axis title of y",
 * `encoding.y.scale.type` → "scale of y", `config.*` → "… (house style)", `layer[1]` → "layer 2");
 * anything else is written as its path from the spec root ("spec.encoding.size.value: 3 → 4").
 * The same change made in several layers of one plot is one sentence ("in layers 1 and 2 of plot 1").
 */
import { formatPath } from "./spec-path";

export type SpecChangeKind = "added" | "removed" | "changed";

interface SpecChange {
  kind: SpecChangeKind;
  /** A change to the spec itself or to the data a name is bound to. */
  area: "spec" | "data";
  /** The sentence shown to people. */
  text: string;
  /** Where, as a path from the spec root (`encoding.y.title`) or `bindings.<name>` for the data. */
  path: string;
}

/** What a data name of a revision points at (the stored `bound` record). */
export interface BoundSource {
  kind: "version" | "analysis";
  id: string;
  versionId: string;
  sha256: string;
  output?: string;
}

/** A version's number and dataset, when the caller knows them; without, files are named by hash. */
export interface VersionLabel {
  datasetId: string;
  number: number;
}

interface RevisionSide {
  spec: unknown;
  bound?: Record<string, BoundSource>;
}

type Seg = string | number;
interface RawChange {
  kind: SpecChangeKind;
  path: Seg[];
  before?: unknown;
  after?: unknown;
}

/** Keys visited first, in this order; the rest alphabetically. */
const ORDER = [
  "type",
  "text",
  "field",
  "$schema",
  "title",
  "description",
  "width",
  "height",
  "data",
  "mark",
  "encoding",
  "x",
  "y",
  "x2",
  "y2",
  "color",
  "layer",
  "vconcat",
  "hconcat",
  "concat",
  "transform",
  "params",
  "config",
];
const VIEW_LISTS: Record<string, string> = { layer: "layer", vconcat: "plot", hconcat: "plot", concat: "plot" };
const POSITIONAL = new Set(["x", "y", "x2", "y2", "xOffset", "yOffset", "theta", "radius"]);
/** Keys whose string values are Vega-Lite keywords, written bare (`mark: point → line`). */
const KEYWORD_KEYS = new Set(["mark", "type", "aggregate", "timeUnit", "interpolate", "orient", "anchor", "align", "baseline", "fontWeight", "stack"]);
const TRANSFORM_OPS = [
  "filter",
  "calculate",
  "aggregate",
  "bin",
  "fold",
  "flatten",
  "impute",
  "joinaggregate",
  "loess",
  "lookup",
  "pivot",
  "quantile",
  "regression",
  "sample",
  "stack",
  "timeUnit",
  "window",
  "density",
  "extent",
];
const OUTPUT_WORDS: Record<string, string> = { curve: "fitted curve", residuals: "residuals", data: "fitted data" };
const MAX_TEXT = 60;
/** Above this many cells the elements of two arrays are compared by position instead of matched. */
const MAX_MATCH_CELLS = 250_000;

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);

function sameJson(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (Array.isArray(a) && Array.isArray(b)) return a.length === b.length && a.every((x, i) => sameJson(x, b[i]));
  if (isObject(a) && isObject(b)) {
    const ka = Object.keys(a).filter((k) => a[k] !== undefined);
    const kb = Object.keys(b).filter((k) => b[k] !== undefined);
    return ka.length === kb.length && ka.every((k) => sameJson(a[k], b[k]));
  }
  return false;
}

/** Stable text of a JSON value with sorted keys, to match array elements. */
function keyOf(v: unknown): string {
  if (Array.isArray(v)) return `[${v.map(keyOf).join(",")}]`;
  if (isObject(v))
    return `{${Object.keys(v)
      .filter((k) => v[k] !== undefined)
      .sort()
      .map((k) => `${JSON.stringify(k)}:${keyOf(v[k])}`)
      .join(",")}}`;
  return JSON.stringify(v) ?? "null";
}

function orderedKeys(a: Record<string, unknown>, b: Record<string, unknown>): string[] {
  const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])];
  const rank = (k: string) => {
    const i = ORDER.indexOf(k);
    return i < 0 ? ORDER.length : i;
  };
  return keys.sort((x, y) => rank(x) - rank(y) || (x < y ? -1 : x > y ? 1 : 0));
}

/** `mark: "point"` and `mark: { type: "point" }` say the same; so do `title: "t"` and `title: { text: "t" }`. */
function normalise(key: Seg | undefined, a: unknown, b: unknown): [unknown, unknown] {
  const field = key === "mark" ? "type" : key === "title" ? "text" : null;
  if (!field || isObject(a) === isObject(b)) return [a, b];
  const wrap = (v: unknown) => (typeof v === "string" ? { [field]: v } : v);
  return [wrap(a), wrap(b)];
}

function diff(a: unknown, b: unknown, path: Seg[], out: RawChange[]): void {
  if (sameJson(a, b)) return;
  if (a === undefined) return void out.push({ kind: "added", path, after: b });
  if (b === undefined) return void out.push({ kind: "removed", path, before: a });
  const [x, y] = normalise(path[path.length - 1], a, b);
  if (isObject(x) && isObject(y)) {
    for (const k of orderedKeys(x, y)) diff(x[k], y[k], [...path, k], out);
    return;
  }
  if (Array.isArray(x) && Array.isArray(y) && (x.some((v) => typeof v === "object" && v !== null) || y.some((v) => typeof v === "object" && v !== null))) {
    return diffList(x, y, path, out);
  }
  out.push({ kind: "changed", path, before: a, after: b });
}

/**
 * Arrays of objects (layers, transforms): equal elements are matched first (longest common
 * subsequence), so one layer inserted reads as "added layer 2", not as changes to every later layer.
 * Unmatched elements between two matches are compared pairwise; the surplus is added or removed.
 */
function diffList(a: unknown[], b: unknown[], path: Seg[], out: RawChange[]): void {
  const n = a.length,
    m = b.length;
  const pairs: Array<[number, number]> = [];
  if ((n + 1) * (m + 1) <= MAX_MATCH_CELLS) {
    const ka = a.map(keyOf),
      kb = b.map(keyOf);
    const w = m + 1;
    const lcs = new Uint32Array((n + 1) * w);
    for (let i = n - 1; i >= 0; i--)
      for (let j = m - 1; j >= 0; j--) lcs[i * w + j] = ka[i] === kb[j] ? lcs[(i + 1) * w + j + 1] + 1 : Math.max(lcs[(i + 1) * w + j], lcs[i * w + j + 1]);
    let i = 0,
      j = 0;
    while (i < n && j < m) {
      if (ka[i] === kb[j]) {
        pairs.push([i++, j++]);
      } else if (lcs[(i + 1) * w + j] >= lcs[i * w + j + 1]) i++;
      else j++;
    }
  }
  pairs.push([n, m]);
  let i = 0,
    j = 0;
  for (const [pi, pj] of pairs) {
    unmatchedRun(a, b, i, pi, j, pj, path, out);
    i = pi + 1;
    j = pj + 1;
  }
}

/** What makes a layer or transform "the same one" though edited: its data name, else its mark, else its operation. */
function identity(v: unknown): string {
  if (!isObject(v)) return "";
  if (isObject(v.data) && typeof v.data.name === "string") return `data ${v.data.name}`;
  const mark = isObject(v.mark) ? v.mark.type : v.mark;
  if (typeof mark === "string") return `mark ${mark}`;
  const op = TRANSFORM_OPS.find((k) => k in v);
  return op ? `${op} ${typeof v.as === "string" ? v.as : ""}` : "";
}

/**
 * Old elements a[i0..i1) against new b[j0..j1), none equal: those with the same identity are compared,
 * then the rest in order while both sides last; the surplus is removed or added.
 */
function unmatchedRun(a: unknown[], b: unknown[], i0: number, i1: number, j0: number, j1: number, path: Seg[], out: RawChange[]): void {
  const partner = new Map<number, number>();
  const taken = new Set<number>();
  for (let i = i0; i < i1; i++) {
    const id = identity(a[i]);
    if (!id) continue;
    for (let j = j0; j < j1; j++) {
      if (!taken.has(j) && identity(b[j]) === id) {
        partner.set(i, j);
        taken.add(j);
        break;
      }
    }
  }
  const freeOld = [];
  for (let i = i0; i < i1; i++) if (!partner.has(i)) freeOld.push(i);
  const freeNew = [];
  for (let j = j0; j < j1; j++) if (!taken.has(j)) freeNew.push(j);
  // Pair the leftovers in order only when neither side has a recognisable identity to contradict it.
  while (freeOld.length && freeNew.length && (!identity(a[freeOld[0]]) || !identity(b[freeNew[0]]))) partner.set(freeOld.shift()!, freeNew.shift()!);
  if (freeOld.length === freeNew.length) while (freeOld.length) partner.set(freeOld.shift()!, freeNew.shift()!);
  const events: Array<{ at: number; run: () => void }> = [];
  for (const [i, j] of partner) events.push({ at: j, run: () => diff(a[i], b[j], [...path, j], out) });
  for (const i of freeOld) events.push({ at: i - i0 + j0 - 0.5, run: () => out.push({ kind: "removed", path: [...path, i], before: a[i] }) });
  for (const j of freeNew) events.push({ at: j, run: () => out.push({ kind: "added", path: [...path, j], after: b[j] }) });
  for (const e of events.sort((x, y) => x.at - y.at)) e.run();
}

// ——— words ———

/** `labelFontSize` → "label font size". */
const words = (key: string) => key.replace(/([a-z0-9])([A-Z])/g, "$1 $2").toLowerCase();

const clip = (s: string) => (s.length > MAX_TEXT ? `${s.slice(0, MAX_TEXT - 1)}…` : s);

/** A value as it reads in a sentence: keywords bare, other text quoted, `null` as "none". */
function valueText(v: unknown, key?: Seg): string {
  if (v === undefined || v === null) return "none";
  if (typeof v === "string") return typeof key === "string" && KEYWORD_KEYS.has(key) && /^[\w-]+$/.test(v) ? v : `"${clip(v)}"`;
  if (typeof v === "number" || typeof v === "boolean") return String(v);
  if (Array.isArray(v)) {
    if (v.every((x) => x === null || typeof x !== "object")) return clip(`[${v.map((x) => valueText(x)).join(", ")}]`);
    if (key === "transform") return clip(v.map((x, i) => summary(x, ["transform", i])).join("; "));
    const noun = typeof key === "string" && VIEW_LISTS[key] ? VIEW_LISTS[key] : "item";
    return `${v.length} ${noun}${v.length === 1 ? "" : "s"}`;
  }
  return isObject(v) ? summary(v, key === undefined ? [] : [key]) : typeof v;
}

/** A short description of an added or removed value: a channel by its field, a transform by its operation, a view by mark and data. */
function summary(v: unknown, path: Seg[]): string {
  if (!isObject(v)) return valueText(v, path[path.length - 1]);
  const parent = path[path.length - 2];
  const last = path[path.length - 1];
  if (parent === "transform" && typeof last === "number") {
    const op = TRANSFORM_OPS.find((k) => k in v) ?? Object.keys(v)[0];
    if (op === undefined) return "empty";
    const arg = v[op];
    const as = typeof v.as === "string" && op === "calculate" ? ` as ${v.as}` : "";
    return `${op} ${typeof arg === "string" ? clip(arg) : clip(keyOf(arg))}${as}`;
  }
  if (parent === "encoding" || "field" in v || "datum" in v || ("value" in v && Object.keys(v).length <= 2)) {
    if (typeof v.field === "string") return `field ${v.field}`;
    if ("datum" in v) return `datum ${valueText(v.datum)}`;
    if ("value" in v) return `value ${valueText(v.value)}`;
  }
  if (last === "mark" && typeof v.type === "string") return v.type;
  if (last === "encoding") return `channels ${Object.keys(v).join(", ")}`;
  const parts: string[] = [];
  const mark = isObject(v.mark) ? v.mark.type : v.mark;
  if (typeof mark === "string") parts.push(`mark ${mark}`);
  if (isObject(v.data) && typeof v.data.name === "string") parts.push(`data "${v.data.name}"`);
  for (const list of Object.keys(VIEW_LISTS)) {
    const items = v[list];
    if (Array.isArray(items)) parts.push(`${items.length} ${list === "layer" ? "layer" : "plot"}${items.length === 1 ? "" : "s"}`);
  }
  if (parts.length) return parts.join(", ");
  const keys = Object.keys(v);
  return keys.length ? `with ${keys.slice(0, 4).join(", ")}${keys.length > 4 ? ", …" : ""}` : "empty";
}

interface Context {
  name: string;
  index: number;
}

/** Splits `vconcat[0].layer[1].encoding.y.title` into the views it sits in and the path inside the innermost one. */
function splitViews(path: Seg[]): { views: Context[]; local: Seg[] } {
  const views: Context[] = [];
  let k = 0;
  while (k + 1 < path.length && typeof path[k] === "string" && VIEW_LISTS[path[k] as string] && typeof path[k + 1] === "number") {
    views.push({ name: VIEW_LISTS[path[k] as string], index: path[k + 1] as number });
    k += 2;
  }
  return { views, local: path.slice(k) };
}

function encodingPlace(r: Seg[]): string | null {
  if (!r.length) return "encoding";
  const [ch, p, q, ...more] = r;
  if (typeof ch !== "string" || more.length) return null;
  if (p === undefined) return `encoding ${ch}`;
  const positional = POSITIONAL.has(ch);
  if (p === "axis" || p === "legend") {
    if (q === undefined) return `${p} of ${ch}`;
    return typeof q === "string" ? `${p} ${words(q)} of ${ch}` : null;
  }
  if (p === "scale") {
    if (q === undefined) return `scale settings of ${ch}`;
    if (q === "type") return `scale of ${ch}`;
    if (q === "domain") return positional ? `axis range of ${ch}` : `scale domain of ${ch}`;
    return typeof q === "string" ? `scale ${words(q)} of ${ch}` : null;
  }
  if (q !== undefined) return null;
  const named: Record<string, string> = {
    title: positional ? "axis title" : "legend title",
    field: "field",
    type: "data type",
    aggregate: "aggregate",
    bin: "binning",
    timeUnit: "time unit",
    sort: "sort order",
    stack: "stacking",
    format: "number format",
  };
  return typeof p === "string" && named[p] ? `${named[p]} of ${ch}` : null;
}

/** The plain name of a place inside one view, or null when it has none (then the path is shown). */
function localPlace(local: Seg[]): string | null {
  const [h, ...r] = local;
  const one = r.length === 1 && typeof r[0] === "string" ? r[0] : null;
  switch (h) {
    case "$schema":
      return r.length ? null : "Vega-Lite schema";
    case "width":
    case "height":
    case "description":
      return r.length ? null : h;
    case "mark":
      return !r.length || one === "type" ? "mark" : one ? `mark ${words(one)}` : null;
    case "title":
      return !r.length || one === "text" ? "title" : one ? `title ${words(one)}` : null;
    case "data":
      return !r.length ? "data" : one === "name" ? "data name" : null;
    case "encoding":
      return encodingPlace(r);
    case "transform":
      if (!r.length) return "transforms";
      if (typeof r[0] !== "number") return null;
      if (r.length === 1) return `transform ${r[0] + 1}`;
      return r.length === 2 && typeof r[1] === "string" ? `${words(r[1])} in transform ${r[0] + 1}` : null;
    case "config":
      if (!r.length) return "house style";
      return r.every((s): s is string => typeof s === "string") ? `${r.map(words).join(" ")} (house style)` : null;
    default:
      return null;
  }
}

const ofViews = (views: Context[]) =>
  views
    .slice()
    .reverse()
    .map((v) => `${v.name} ${v.index + 1}`)
    .join(" of ");

const listText = (items: string[]) => (items.length < 2 ? items.join("") : `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`);

interface Placed {
  change: RawChange;
  /** The plain place inside the innermost view, null for a view itself, undefined when it has no name. */
  place: string | null | undefined;
  views: Context[];
}

function place(change: RawChange): Placed {
  const { views, local } = splitViews(change.path);
  if (!local.length) return { change, place: views.length ? null : undefined, views };
  return { change, place: localPlace(local) ?? undefined, views };
}

function values(c: RawChange): string {
  const key = c.path[c.path.length - 1];
  if (c.kind === "changed") return `${valueText(c.before, key)} → ${valueText(c.after, key)}`;
  return summary(c.kind === "added" ? c.after : c.before, c.path);
}

function sentence(kind: SpecChangeKind, where: string, vals: string): string {
  return kind === "changed" ? `${where}: ${vals}` : `${kind} ${where} (${vals})`;
}

/** Sentences for the spec, with the same change across sibling views told once. */
function specSentences(raw: RawChange[]): SpecChange[] {
  const out: SpecChange[] = [];
  const groups = new Map<string, { first: Placed; indices: number[]; index: number }>();
  for (const c of raw) {
    const p = place(c);
    const path = formatPath(c.path);
    if (p.place === undefined) {
      out.push({ kind: c.kind, area: "spec", text: sentence(c.kind, `spec.${path}`, values(c)), path });
      continue;
    }
    const inner = p.views[p.views.length - 1];
    const outer = p.views.slice(0, -1);
    if (p.place === null) {
      out.push({
        kind: c.kind,
        area: "spec",
        text: sentence(c.kind, `${inner.name} ${inner.index + 1}${outer.length ? ` of ${ofViews(outer)}` : ""}`, values(c)),
        path,
      });
      continue;
    }
    const key = JSON.stringify([c.kind, p.place, values(c), outer, inner?.name ?? null]);
    const g = groups.get(key);
    if (g) {
      if (inner && !g.indices.includes(inner.index)) g.indices.push(inner.index);
      continue;
    }
    groups.set(key, { first: p, indices: inner ? [inner.index] : [], index: out.length });
    out.push({ kind: c.kind, area: "spec", text: "", path });
  }
  for (const { first, indices, index } of groups.values()) {
    const c = first.change;
    let where = first.place as string;
    if (first.views.length) {
      const inner = first.views[first.views.length - 1];
      const outer = first.views.slice(0, -1);
      const innerText = indices.length > 1 ? `${inner.name}s ${listText(indices.map((i) => String(i + 1)))}` : `${inner.name} ${inner.index + 1}`;
      where += ` in ${innerText}${outer.length ? ` of ${ofViews(outer)}` : ""}`;
    }
    out[index] = { ...out[index], text: sentence(c.kind, where, values(c)) };
  }
  return out;
}

// ——— data ———

function sourceText(b: BoundSource, versions: Record<string, VersionLabel>): string {
  if (b.kind === "analysis") return `stored fit, ${OUTPUT_WORDS[b.output ?? "curve"] ?? b.output}`;
  const v = versions[b.versionId];
  return v ? `version ${v.number}` : `file ${b.sha256.slice(0, 8)}`;
}

function dataSentences(a: Record<string, BoundSource>, b: Record<string, BoundSource>, versions: Record<string, VersionLabel>): SpecChange[] {
  const out: SpecChange[] = [];
  for (const name of [...new Set([...Object.keys(a), ...Object.keys(b)])].sort()) {
    const x = a[name],
      y = b[name];
    const path = `bindings.${name}`;
    const label = `data "${name}"`;
    if (!x && y) out.push({ kind: "added", area: "data", path, text: `added ${label} (${sourceText(y, versions)})` });
    else if (x && !y) out.push({ kind: "removed", area: "data", path, text: `removed ${label} (${sourceText(x, versions)})` });
    else if (x && y && (x.kind !== y.kind || x.id !== y.id || x.sha256 !== y.sha256 || (x.output ?? "") !== (y.output ?? ""))) {
      let text: string;
      if (x.kind === "version" && y.kind === "version") {
        const vx = versions[x.versionId],
          vy = versions[y.versionId];
        if (vx && vy && vx.datasetId === vy.datasetId) text = `version ${vx.number} → ${vy.number}`;
        else if (vx && vy) text = `version ${vx.number} → version ${vy.number} of another dataset`;
        else text = `${sourceText(x, versions)} → ${sourceText(y, versions)}`;
      } else if (x.kind === "analysis" && y.kind === "analysis" && x.id === y.id) {
        text = `${OUTPUT_WORDS[x.output ?? "curve"] ?? x.output} → ${OUTPUT_WORDS[y.output ?? "curve"] ?? y.output}`;
      } else if (x.kind === "analysis" && y.kind === "analysis") {
        text = `a different stored fit (${OUTPUT_WORDS[y.output ?? "curve"] ?? y.output})`;
      } else text = `${sourceText(x, versions)} → ${sourceText(y, versions)}`;
      out.push({ kind: "changed", area: "data", path, text: `${label}: ${text}` });
    }
  }
  return out;
}

/**
 * Every change from `before` to `after`: the spec's first, in reading order, then the data's.
 * `versions` names the bound versions by number where known (by version id).
 */
export function describeSpecChange(before: RevisionSide, after: RevisionSide, versions: Record<string, VersionLabel> = {}): SpecChange[] {
  const raw: RawChange[] = [];
  diff(before.spec, after.spec, [], raw);
  return [...specSentences(raw), ...dataSentences(before.bound ?? {}, after.bound ?? {}, versions)];
}
