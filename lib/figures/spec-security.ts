/**
 * The security rules for collaborator-written Vega-Lite specs, applied everywhere in the tree
 * (layers, concat, facet, repeat, transforms, lookups, params, config): no URL loads, no links,
 * no images, only bound or small inline data, expressions limited by ./spec-expressions, no
 * display options through `usermeta`, and a budget for settings that would hang a browser.
 * Pure: the server validates with it and the browser runs it again before drawing a panel.
 */
import { checkExpression, checkFieldName } from "./spec-expressions";
import type { SpecPath } from "./spec-path";
import { budget, countViews, fmt, isObject, MAX_VIEWS, transformBudget, type Json } from "./spec-budget";

const MAX_INLINE_VALUES = 5_000;

/**
 * `usermeta` keys a spec may carry: plain notes, and the builder's record of the template and
 * options that made the spec (`template`, ./template-record). vega-embed reads
 * `usermeta.embedOptions` and merges it over the app's own options (actions, sourceHeader HTML,
 * i18n, patch, loader, ast …), so that key, and every key not listed here, is refused.
 */
const USERMETA_KEYS: ReadonlySet<string> = new Set(["description", "note", "notes", "source", "tags", "template"]);
/** Nesting allowed inside an allowed usermeta key: `{ note: { sample: { id: "B14" } } }`. */
const MAX_USERMETA_NESTING = 2;
/** The builder's record nests deeper: `template.options.markers[0].label`, `template.options.print.widthMm`. */
const MAX_TEMPLATE_NESTING = 4;
const EMBED_OPTIONS_MESSAGE = "display options (usermeta.embedOptions) are set by Prooflight and cannot come from a spec";
const PROTO_MESSAGE = 'the key "__proto__" is not allowed';

export interface SecurityIssue {
  path: SpecPath;
  message: string;
}

const URL_MESSAGE = "specs cannot load data from a URL; bind a dataset version instead";

const EXPRESSION_KEYS = new Set(["calculate", "expr", "signal", "update", "labelExpr", "toggle"]);
const PREDICATE_KEYS = new Set(["filter", "test"]);
const FIELD_KEYS = new Set(["field", "as", "groupby", "fields", "key"]);
const FORMAT_TYPES = new Set(["number", "time", "utc"]);
const SCHEMA_URL = /^https:\/\/vega\.github\.io\/schema\/vega-lite\/v[56](?:\.\d+){0,2}\.json$/;
const PLAIN_EVENT =
  /^(?:click|dblclick|pointerover|pointerout|pointerdown|pointerup|pointermove|mouseover|mouseout|mousedown|mouseup|mousemove|touchstart|touchend|touchmove|keydown|keyup|wheel)$/;

interface Context {
  issues: SecurityIssue[];
  params: Set<string>;
  dataNames: Set<string>;
  datasetNames: Set<string>;
  inline: Array<{ path: SpecPath; count: number }>;
}

export interface SecurityReport {
  issues: SecurityIssue[];
  /** Data names the spec expects to be bound at render time (not defined in `datasets`), sorted. */
  dataNames: string[];
  inlineValues: number;
}

/** Applies the rules to a plain JSON spec (already parsed; not checked against the schema). */
export function checkSpecSecurity(spec: Record<string, unknown>): SecurityReport {
  const ctx: Context = { issues: [], params: new Set(), dataNames: new Set(), datasetNames: new Set(), inline: [] };
  collectParams(spec, ctx.params);
  if (spec.$schema !== undefined && (typeof spec.$schema !== "string" || !SCHEMA_URL.test(spec.$schema))) {
    ctx.issues.push({ path: ["$schema"], message: "only Vega-Lite v5/v6 specs are accepted (https://vega.github.io/schema/vega-lite/v6.json)" });
  }
  if (isObject(spec.datasets)) {
    for (const [name, values] of Object.entries(spec.datasets)) {
      ctx.datasetNames.add(name);
      if (Array.isArray(values)) {
        ctx.inline.push({ path: ["datasets", name], count: values.length });
        refuseProtoKeys(values, ["datasets", name], ctx);
      } else ctx.issues.push({ path: ["datasets", name], message: "inline datasets must be arrays of rows" });
    }
  }
  walk(spec as Record<string, Json>, [], ctx);
  const views = countViews(spec as Json);
  if (views > MAX_VIEWS) {
    const key = ["repeat", "vconcat", "hconcat", "concat", "layer", "facet"].find((k) => k in spec);
    ctx.issues.push({
      path: key ? [key] : [],
      message: `the spec draws ${fmt(views)} views; the limit is ${fmt(MAX_VIEWS)} (each layer, concatenated and repeated view counts)`,
    });
  }
  const total = ctx.inline.reduce((s, x) => s + x.count, 0);
  if (total > MAX_INLINE_VALUES) {
    const largest = ctx.inline.reduce((a, b) => (b.count > a.count ? b : a));
    ctx.issues.push({
      path: largest.path,
      message: `inline data holds ${total.toLocaleString("en")} values in all; the limit is ${MAX_INLINE_VALUES.toLocaleString("en")}; bind a dataset version instead`,
    });
  }
  const dataNames = [...ctx.dataNames].filter((n) => !ctx.datasetNames.has(n)).sort();
  return { issues: ctx.issues, dataNames, inlineValues: total };
}

function collectParams(node: unknown, out: Set<string>): void {
  if (Array.isArray(node)) return node.forEach((n) => collectParams(n, out));
  if (!isObject(node)) return;
  for (const [k, v] of Object.entries(node)) {
    if (k === "usermeta" || k === "datasets" || k === "values") continue;
    if (k === "params" && Array.isArray(v)) for (const p of v) if (isObject(p) && typeof p.name === "string") out.add(p.name);
    collectParams(v, out);
  }
}

function walk(node: Json, path: SpecPath, ctx: Context): void {
  if (Array.isArray(node)) return node.forEach((n, i) => walk(n, [...path, i], ctx));
  if (!isObject(node)) return;
  transformBudget(node, path, ctx);
  for (const [key, value] of Object.entries(node)) {
    const at = [...path, key];
    const issue = (message: string, where: SpecPath = at) => ctx.issues.push({ path: where, message });
    if (key === "__proto__") {
      issue(PROTO_MESSAGE);
      continue;
    }
    if (key === "usermeta") {
      checkUsermeta(value, at, ctx);
      continue;
    }
    if (key === "datasets" && path.length === 0) continue;
    if (!budget(key, value, path, ctx)) continue;
    if (key === "url") {
      issue("images and URLs are not allowed in figures");
      continue;
    }
    if (key === "href") {
      issue("links (href) are not allowed in figures");
      continue;
    }
    if (key === "mark" && (value === "image" || (isObject(value) && value.type === "image"))) {
      issue("image marks are not allowed in figures", isObject(value) ? [...at, "type"] : at);
      continue;
    }
    if (key === "data" && isObject(value)) {
      checkData(value, at, ctx);
      continue;
    }
    if (EXPRESSION_KEYS.has(key) && typeof value === "string") {
      expression(value, at, ctx);
      continue;
    }
    if (PREDICATE_KEYS.has(key)) {
      predicate(value, at, ctx);
      continue;
    }
    const onIsField = key === "on" && ("regression" in node || "loess" in node); // the predictor field, not an event
    if ((key === "on" || key === "clear") && typeof value === "string" && !onIsField) {
      if (!PLAIN_EVENT.test(value)) issue("only plain event names (click, pointerover, …) are allowed; event filters and streams are not");
      continue;
    }
    if (key === "bind" && isObject(value) && "element" in value) {
      issue("binding inputs to page elements is not allowed", [...at, "element"]);
      continue;
    }
    if (key === "formatType" && typeof value === "string" && !FORMAT_TYPES.has(value)) {
      issue("formatType must be number, time or utc");
      continue;
    }
    if (key === "customFormatTypes" && value === true) {
      issue("custom format types are not allowed");
      continue;
    }
    if (FIELD_KEYS.has(key) || onIsField) {
      const fields = typeof value === "string" ? [value] : Array.isArray(value) ? value : [];
      fields.forEach((f, i) => {
        const bad = typeof f === "string" ? checkFieldName(f) : null;
        if (bad) issue(bad, typeof value === "string" ? at : [...at, i]);
      });
    }
    walk(value, at, ctx);
  }
}

function expression(src: string, at: SpecPath, ctx: Context): void {
  const bad = checkExpression(src, ctx.params);
  if (bad) ctx.issues.push({ path: at, message: `expression refused: ${bad}` });
}

function predicate(value: Json, at: SpecPath, ctx: Context): void {
  if (typeof value === "string") return expression(value, at, ctx);
  if (Array.isArray(value)) return value.forEach((v, i) => predicate(v, [...at, i], ctx));
  if (!isObject(value)) return;
  for (const op of ["and", "or", "not"]) if (op in value) predicate(value[op], [...at, op], ctx);
  const rest = Object.fromEntries(Object.entries(value).filter(([k]) => k !== "and" && k !== "or" && k !== "not"));
  walk(rest, at, ctx);
}

function checkData(d: Record<string, Json>, at: SpecPath, ctx: Context): void {
  if ("url" in d) ctx.issues.push({ path: [...at, "url"], message: URL_MESSAGE });
  if ("graticule" in d || "sphere" in d) ctx.issues.push({ path: at, message: "generated geographic data is not used in figures" });
  if ("values" in d) {
    if (Array.isArray(d.values)) {
      ctx.inline.push({ path: [...at, "values"], count: d.values.length });
      refuseProtoKeys(d.values, [...at, "values"], ctx);
    } else ctx.issues.push({ path: [...at, "values"], message: "inline values must be an array of rows; bind a dataset version for files" });
  }
  if (isObject(d.sequence)) {
    const { start, stop, step = 1 } = d.sequence;
    const n = typeof start === "number" && typeof stop === "number" && typeof step === "number" && step !== 0 ? Math.ceil((stop - start) / step) : NaN;
    if (!Number.isFinite(n)) ctx.issues.push({ path: [...at, "sequence"], message: "sequence needs numeric start, stop and a non-zero step" });
    else ctx.inline.push({ path: [...at, "sequence"], count: Math.max(0, n) });
  }
  if (typeof d.name === "string" && !("values" in d) && !("sequence" in d) && !("url" in d)) ctx.dataNames.add(d.name);
  const rest = Object.fromEntries(Object.entries(d).filter(([k]) => k !== "values" && k !== "url" && k !== "sequence"));
  walk(rest, at, ctx);
}

/** `usermeta` holds only allow-listed notes of plain values; never vega-embed's options. */
function checkUsermeta(value: Json, at: SpecPath, ctx: Context): void {
  if (!isObject(value)) {
    ctx.issues.push({ path: at, message: "usermeta must be an object of notes (description, note, notes, source, tags)" });
    return;
  }
  for (const [key, v] of Object.entries(value)) {
    const where = [...at, key];
    if (key === "embedOptions") ctx.issues.push({ path: where, message: EMBED_OPTIONS_MESSAGE });
    else if (key === "__proto__") ctx.issues.push({ path: where, message: PROTO_MESSAGE });
    else if (!USERMETA_KEYS.has(key)) {
      ctx.issues.push({
        path: where,
        message: `usermeta may only hold description, note, notes, source and tags; "${key}" is not one of them (display options are set by Prooflight; "template" is the builder's own record)`,
      });
    } else usermetaValue(v, where, 1, ctx, key === "template" ? MAX_TEMPLATE_NESTING : MAX_USERMETA_NESTING);
  }
}

function usermetaValue(value: Json, at: SpecPath, level: number, ctx: Context, maxNesting: number): void {
  if (value === null || typeof value !== "object") return;
  if (level > maxNesting) {
    ctx.issues.push({
      path: at,
      message: `usermeta values must be text, numbers or small lists or objects of them (nested at most ${maxNesting} levels)`,
    });
    return;
  }
  if (Array.isArray(value)) return value.forEach((v, i) => usermetaValue(v, [...at, i], level + 1, ctx, maxNesting));
  for (const [key, v] of Object.entries(value)) {
    if (key === "embedOptions") ctx.issues.push({ path: [...at, key], message: EMBED_OPTIONS_MESSAGE });
    else if (key === "__proto__") ctx.issues.push({ path: [...at, key], message: PROTO_MESSAGE });
    else usermetaValue(v, [...at, key], level + 1, ctx, maxNesting);
  }
}

/** The first `__proto__` key in each row of inline data (rows are not walked otherwise). */
function refuseProtoKeys(rows: Json[], at: SpecPath, ctx: Context): void {
  const find = (node: Json, path: SpecPath): SpecPath | null => {
    if (Array.isArray(node)) {
      for (let i = 0; i < node.length; i++) {
        const p = find(node[i], [...path, i]);
        if (p) return p;
      }
    } else if (isObject(node)) {
      for (const [k, v] of Object.entries(node)) {
        if (k === "__proto__") return [...path, k];
        const p = find(v, [...path, k]);
        if (p) return p;
      }
    }
    return null;
  };
  const hit = find(rows, at);
  if (hit) ctx.issues.push({ path: hit, message: PROTO_MESSAGE });
}
