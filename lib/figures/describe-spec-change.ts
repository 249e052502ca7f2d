/**
 * What changed between two revisions of a panel, in words: a structural comparison of the two specs
 * and of the data each name is bound to, one sentence per change.
 *
 * The common Vega-Lite places get plain names (`encoding.y.title` → "axis title of y",
 * `encoding.y.scale.type` → "scale of y", `config.*` → "… (house style)", `layer[1]` → "layer 2");
 * anything else is written as its path from the spec root ("spec.encoding.size.value: 3 → 4").
 * The same change made in several layers of one plot is one sentence ("in layers 1 and 2 of plot 1").
 * The builder's record of template options (`usermeta.template`) is left out: what it changes is in the spec.
 */
import { formatPath } from "./spec-path";
import { diffJson, isObject, keyOf, TRANSFORM_OPS, type RawChange, type Seg, type SpecChangeKind } from "./spec-structural-diff";
import { withoutTemplateRecord } from "./template-record";

export type { SpecChangeKind };

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

const VIEW_LISTS: Record<string, string> = { layer: "layer", vconcat: "plot", hconcat: "plot", concat: "plot" };
const POSITIONAL = new Set(["x", "y", "x2", "y2", "xOffset", "yOffset", "theta", "radius"]);
/** Keys whose string values are Vega-Lite keywords, written bare (`mark: point → line`). */
const KEYWORD_KEYS = new Set(["mark", "type", "aggregate", "timeUnit", "interpolate", "orient", "anchor", "align", "baseline", "fontWeight", "stack"]);
const OUTPUT_WORDS: Record<string, string> = { curve: "fitted curve", residuals: "residuals", data: "fitted data" };
const MAX_TEXT = 60;
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
  // The builder's record (usermeta.template) is how the spec was made, not what it shows: its changes are the spec's.
  const spec = diffJson(withoutTemplateRecord(before.spec), withoutTemplateRecord(after.spec));
  return [...specSentences(spec), ...dataSentences(before.bound ?? {}, after.bound ?? {}, versions)];
}
