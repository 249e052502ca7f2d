/**
 * Spec ↔ data integrity (issue 17): which fields a Vega-Lite spec reads from each bound data name,
 * and which of them the bound data does not have. A spec that plots a column the data lacks draws
 * an empty plot without any error from Vega, so the server refuses it at save (422) and flags old
 * revisions at render.
 *
 * Collected: encodings (x, y, color, size, shape, text, detail, order, tooltip arrays, facet/row/
 * column …, nested `condition`s, `sort.field`, `aggregate: {argmin|argmax}`), the facet operator,
 * `params[].select.fields`, and transforms — filter predicates (`field`, and `datum.x` /
 * `datum["x"]` in expression strings), calculate, aggregate, joinaggregate, window, bin, timeUnit,
 * fold, flatten, lookup (the looked-up data's key and fields too), density, regression, loess,
 * quantile, pivot, impute, stack, extent. Fields a transform creates (`as`, fold's `key`/`value`,
 * density's `value`/`density` …) count as present for the view and its children; after a pivot
 * any name may exist, so nothing after it is reported. Layers inherit data, transforms and
 * encoding; a child with its own `data` starts afresh; repeat references `{ "repeat": "row" }`
 * resolve to every name of that repeat list. Inline data (`values`, `sequence`, top-level
 * `datasets`) is not checked.
 *
 * Field paths: `a.b` and `a[0]` read the column `a` (Vega-Lite's nested access); `a\.b` is the
 * column `a.b`. Expression names (`datum["a.b"]`) are columns as written.
 *
 * The original header is not accepted as an alias: a field written as the file's header (`t_us`,
 * `t (µs)`) is refused with "did you mean `t`", naming the header the column was made from, so the
 * stored spec always names the real column and what a reviewer sees is what the export draws.
 * Pure: the server checks with it and the browser runs it on preview data.
 */
import { parseHeaderUnit } from "@/lib/data/units";
import { datumFields } from "./spec-expressions";
import { formatPath, toPointer, type SpecPath } from "./spec-path";

export interface FieldUse {
  /** The bound data name the field is read from. */
  dataName: string;
  /** The column it reads (first path segment, escapes removed). */
  field: string;
  /** The field as written in the spec (a repeat reference is written as the repeated name). */
  written: string;
  path: SpecPath;
  /** Encoding channel, "filter" for filter predicates, "transform" for other transforms. */
  channel: string;
  /** A quantitative or temporal position channel (x, y, x2, y2, theta, radius …) on the raw column, not aggregated or binned: rows without a number there are dropped. */
  continuous: boolean;
  /** The encoding's `type` (quantitative, temporal, nominal …) when written, else null. */
  type: string | null;
}

type Json = unknown;
type Obj = Record<string, Json>;
const isObj = (v: Json): v is Obj => typeof v === "object" && v !== null && !Array.isArray(v);
const strings = (v: Json): string[] => (typeof v === "string" ? [v] : Array.isArray(v) ? v.filter((x): x is string => typeof x === "string") : []);

interface Scope {
  data: string | null;
  created: Set<string>;
  /** After a pivot any name may be a column. */
  open: boolean;
  repeat: Record<string, string[]>;
}

type Channel = [name: string, def: Json, path: SpecPath];

const POSITION = new Set(["x", "y", "x2", "y2", "theta", "theta2", "radius", "radius2", "latitude", "longitude", "latitude2", "longitude2"]);
const CONTINUOUS_TYPES = new Set(["quantitative", "temporal"]);

/** The column a Vega-Lite field path reads: up to the first unescaped `.` or `[`, escapes removed. */
export function columnOfField(field: string): string {
  let out = "";
  for (let i = 0; i < field.length; i++) {
    const c = field[i];
    if (c === "\\" && i + 1 < field.length) {
      out += field[++i];
      continue;
    }
    if (c === "." || c === "[") break;
    out += c;
  }
  return out;
}

/** Every use of a bound data name's field in the spec, in document order (duplicates of one place removed). */
export function specFieldUses(spec: unknown): FieldUse[] {
  if (!isObj(spec)) return [];
  const inline = new Set(isObj(spec.datasets) ? Object.keys(spec.datasets) : []);
  const uses: FieldUse[] = [];
  const seen = new Set<string>();

  const record = (scope: Scope, written: string, path: SpecPath, channel: string, opts: { raw?: boolean; continuous?: boolean; type?: string | null } = {}) => {
    if (scope.data === null || scope.open) return;
    const field = opts.raw ? written : columnOfField(written);
    if (field === "" || scope.created.has(field)) return;
    const key = JSON.stringify([scope.data, written, path]);
    if (seen.has(key)) return;
    seen.add(key);
    uses.push({ dataName: scope.data, field, written, path, channel, continuous: Boolean(opts.continuous), type: opts.type ?? null });
  };

  /** A `field` value: a name, or `{ repeat: "row" | "column" | "layer" | "repeat" }`. */
  const fieldRef = (value: Json, scope: Scope, path: SpecPath, channel: string, continuous = false, type: string | null = null) => {
    if (typeof value === "string") record(scope, value, path, channel, { continuous, type });
    else if (isObj(value) && typeof value.repeat === "string") {
      for (const name of scope.repeat[value.repeat] ?? []) record(scope, name, [...path, "repeat"], channel, { continuous, type });
    }
  };
  const fieldList = (value: Json, scope: Scope, path: SpecPath, channel: string) => {
    if (Array.isArray(value)) value.forEach((v, i) => fieldRef(v, scope, [...path, i], channel));
    else fieldRef(value, scope, path, channel);
  };
  const expression = (src: Json, scope: Scope, path: SpecPath, channel: string) => {
    if (typeof src !== "string") return;
    for (const f of datumFields(src)) record(scope, f, path, channel, { raw: true });
  };
  const predicate = (p: Json, scope: Scope, path: SpecPath) => {
    if (typeof p === "string") return expression(p, scope, path, "filter");
    if (Array.isArray(p)) return p.forEach((x, i) => predicate(x, scope, [...path, i]));
    if (!isObj(p)) return;
    for (const op of ["and", "or", "not"]) if (op in p) predicate(p[op], scope, [...path, op]);
    if ("field" in p) fieldRef(p.field, scope, [...path, "field"], "filter");
  };
  const create = (scope: Scope, names: Json) => {
    for (const n of strings(names)) scope.created.add(n);
  };
  const createWithEnd = (scope: Scope, as: Json) => {
    if (typeof as === "string") {
      scope.created.add(as);
      scope.created.add(`${as}_end`);
    } else create(scope, as);
  };
  const sortFields = (sort: Json, scope: Scope, path: SpecPath, channel: string) => {
    if (Array.isArray(sort))
      sort.forEach((s, i) => {
        if (isObj(s)) fieldRef(s.field, scope, [...path, i, "field"], channel);
      });
    else if (isObj(sort) && "field" in sort) fieldRef(sort.field, scope, [...path, "field"], channel);
  };

  const channelDef = (def: Json, channel: string, path: SpecPath, scope: Scope) => {
    if (Array.isArray(def)) return def.forEach((d, i) => channelDef(d, channel, [...path, i], scope));
    if (!isObj(def)) return;
    if ("field" in def) {
      const continuous = POSITION.has(channel) && CONTINUOUS_TYPES.has(def.type as string) && !def.aggregate && !def.bin;
      fieldRef(def.field, scope, [...path, "field"], channel, continuous, typeof def.type === "string" ? def.type : null);
    }
    if (isObj(def.aggregate))
      for (const k of ["argmin", "argmax"]) if (k in def.aggregate) fieldRef(def.aggregate[k], scope, [...path, "aggregate", k], channel);
    if ("sort" in def) sortFields(def.sort, scope, [...path, "sort"], channel);
    if ("condition" in def) {
      const conds = Array.isArray(def.condition)
        ? def.condition.map((c, i) => [c, [...path, "condition", i]] as const)
        : [[def.condition, [...path, "condition"]] as const];
      for (const [c, at] of conds) {
        if (!isObj(c)) continue;
        if ("test" in c) predicate(c.test, scope, [...at, "test"]);
        channelDef(Object.fromEntries(Object.entries(c).filter(([k]) => k !== "test" && k !== "condition")), channel, at, scope);
      }
    }
  };

  const transform = (t: Json, scope: Scope, path: SpecPath) => {
    if (!isObj(t)) return;
    const at = (...k: Array<string | number>) => [...path, ...k];
    const groupby = () => fieldList(t.groupby, scope, at("groupby"), "transform");
    if ("filter" in t) predicate(t.filter, scope, at("filter"));
    else if ("calculate" in t) {
      expression(t.calculate, scope, at("calculate"), "transform");
      create(scope, t.as);
    } else if ("lookup" in t) {
      fieldRef(t.lookup, scope, at("lookup"), "transform");
      const from = isObj(t.from) ? t.from : {};
      if (isObj(from.data)) {
        const other = viewData(from.data, null);
        const fromScope: Scope = { data: other, created: new Set(), open: false, repeat: scope.repeat };
        fieldRef(from.key, fromScope, at("from", "key"), "transform");
        fieldList(from.fields, fromScope, at("from", "fields"), "transform");
      }
      if (t.as !== undefined) create(scope, t.as);
      else create(scope, from.fields);
    } else if (Array.isArray(t.aggregate) || Array.isArray(t.joinaggregate) || Array.isArray(t.window)) {
      const key = Array.isArray(t.aggregate) ? "aggregate" : Array.isArray(t.joinaggregate) ? "joinaggregate" : "window";
      (t[key] as Json[]).forEach((op, i) => {
        if (!isObj(op)) return;
        fieldRef(op.field, scope, at(key, i, "field"), "transform");
        create(scope, op.as);
      });
      groupby();
      if (key === "window") sortFields(t.sort, scope, at("sort"), "transform");
    } else if ("fold" in t) {
      fieldList(t.fold, scope, at("fold"), "transform");
      const as = strings(t.as);
      create(scope, [as[0] ?? "key", as[1] ?? "value"]);
    } else if ("flatten" in t) {
      fieldList(t.flatten, scope, at("flatten"), "transform");
      create(scope, t.as);
    } else if ("density" in t) {
      fieldRef(t.density, scope, at("density"), "transform");
      groupby();
      const as = strings(t.as);
      create(scope, [as[0] ?? "value", as[1] ?? "density"]);
    } else if ("regression" in t || "loess" in t) {
      const key = "regression" in t ? "regression" : "loess";
      fieldRef(t[key], scope, at(key), "transform");
      fieldRef(t.on, scope, at("on"), "transform");
      groupby();
      create(scope, t.as);
    } else if ("quantile" in t) {
      fieldRef(t.quantile, scope, at("quantile"), "transform");
      groupby();
      const as = strings(t.as);
      create(scope, [as[0] ?? "prob", as[1] ?? "value"]);
    } else if ("pivot" in t) {
      fieldRef(t.pivot, scope, at("pivot"), "transform");
      fieldRef(t.value, scope, at("value"), "transform");
      groupby();
      scope.open = true;
    } else if ("impute" in t) {
      fieldRef(t.impute, scope, at("impute"), "transform");
      fieldRef(t.key, scope, at("key"), "transform");
      groupby();
    } else if ("stack" in t) {
      fieldRef(t.stack, scope, at("stack"), "transform");
      groupby();
      sortFields(t.sort, scope, at("sort"), "transform");
      createWithEnd(scope, t.as);
    } else if ("extent" in t) {
      fieldRef(t.extent, scope, at("extent"), "transform");
    } else if ("bin" in t || "timeUnit" in t) {
      fieldRef(t.field, scope, at("field"), "transform");
      createWithEnd(scope, t.as);
    }
  };

  /** The data name a view reads: its own `data` (null when inline or unbound), else the parent's. */
  function viewData(data: Json, inherited: string | null): string | null {
    if (data === undefined) return inherited;
    if (!isObj(data)) return null;
    if (typeof data.name !== "string" || "values" in data || "url" in data || "sequence" in data || inline.has(data.name)) return null;
    return data.name;
  }

  const view = (node: Json, path: SpecPath, parent: Scope, inheritedEncoding: Channel[]) => {
    if (!isObj(node)) return;
    const ownData = "data" in node;
    const scope: Scope = ownData
      ? { data: viewData(node.data, null), created: new Set(), open: false, repeat: parent.repeat }
      : { ...parent, created: new Set(parent.created) };
    if (Array.isArray(node.transform)) node.transform.forEach((t, i) => transform(t, scope, [...path, "transform", i]));

    const own: Channel[] = isObj(node.encoding) ? Object.entries(node.encoding).map(([k, v]) => [k, v, [...path, "encoding", k]]) : [];
    const encoding = [...inheritedEncoding.filter(([k]) => !own.some(([o]) => o === k)), ...own];
    if ("mark" in node) {
      for (const [k, def, at] of encoding) channelDef(def, k, at, scope);
      if (Array.isArray(node.params))
        node.params.forEach((p, i) => {
          if (isObj(p) && isObj(p.select)) fieldList(p.select.fields, scope, [...path, "params", i, "select", "fields"], "params");
        });
    }
    if (Array.isArray(node.layer)) node.layer.forEach((child, i) => view(child, [...path, "layer", i], scope, encoding));
    for (const key of ["concat", "hconcat", "vconcat"]) {
      const items = node[key];
      if (Array.isArray(items)) items.forEach((child, i) => view(child, [...path, key, i], scope, []));
    }
    if ("facet" in node && isObj(node.facet)) {
      const f = node.facet;
      if ("field" in f) channelDef(f, "facet", [...path, "facet"], scope);
      else for (const k of ["row", "column"]) if (k in f) channelDef(f[k], k, [...path, "facet", k], scope);
    }
    let inner = scope;
    if ("repeat" in node) {
      const r = node.repeat;
      const lists: Record<string, string[]> = Array.isArray(r)
        ? { repeat: strings(r) }
        : isObj(r)
          ? Object.fromEntries(["row", "column", "layer"].filter((k) => k in r).map((k) => [k, strings(r[k])]))
          : {};
      inner = { ...scope, repeat: { ...scope.repeat, ...lists } };
    }
    if (isObj(node.spec)) view(node.spec, [...path, "spec"], inner, []);
  };

  view(spec, [], { data: null, created: new Set(), open: false, repeat: {} }, []);
  return uses;
}

/** The columns the spec reads, per bound data name, each once, sorted. */
export function specFields(spec: unknown): Record<string, string[]> {
  const out: Record<string, Set<string>> = {};
  for (const u of specFieldUses(spec)) (out[u.dataName] ??= new Set()).add(u.field);
  return Object.fromEntries(
    Object.entries(out)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
      .map(([k, v]) => [k, [...v].sort()]),
  );
}

/** A column of bound data as the check sees it; `header` is the file's header cell, when recorded. */
export interface ColumnInfo {
  name: string;
  unit?: string | null;
  header?: string | null;
}

export interface Suggestion {
  column: string;
  /** header: the field is the header the column was made from; unit: the field splits into the column's name and a unit; case; near (edit distance); escape (a dot that needs `\.`). */
  reason: "header" | "unit" | "case" | "near" | "escape";
  /** What to write in the spec (the column, escaped for a field path when needed). */
  write: string;
  text: string;
}

export interface FieldProblem {
  dataName: string;
  field: string;
  written: string;
  channel: string;
  /** Readable place, e.g. "layer[0].encoding.x.field". */
  path: string;
  pointer: string;
  columns: string[];
  suggestion: Suggestion | null;
  /** "the field `t_us` is not a column of the data `echo` (columns: t, signal). Did you mean `t` …?" */
  message: string;
}

const tick = (s: string) => `\`${s}\``;
const escapeField = (column: string) => column.replace(/[.[\]\\]/g, "\\$&");
const MAX_LISTED = 20;

function listColumns(columns: string[]): string {
  if (!columns.length) return "it has no columns";
  const shown = columns.slice(0, MAX_LISTED).join(", ");
  return `columns: ${shown}${columns.length > MAX_LISTED ? ` and ${columns.length - MAX_LISTED} more` : ""}`;
}

/** Edits (insert, delete, substitute, swap two neighbours) from a to b (optimal string alignment). */
function editDistance(a: string, b: string): number {
  if (Math.abs(a.length - b.length) > 3) return Math.abs(a.length - b.length);
  const d = Array.from({ length: a.length + 1 }, (_, i) => Array.from({ length: b.length + 1 }, (_, j) => (i === 0 ? j : j === 0 ? i : 0)));
  for (let i = 1; i <= a.length; i++) {
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
    }
  }
  return d[a.length][b.length];
}

const madeFrom = (c: ColumnInfo) => (c.header && c.header !== c.name ? ` (the column made from the header ${tick(c.header)})` : "");

/**
 * The column a missing field most likely meant, in this order: the field is a column's original
 * header; the field splits into a column's name and a unit by the header rule (lib/data/units:
 * `t_us`, `t (µs)`, `t [us]`, `t / µs` → `t`, unit µs); a dot that should be escaped; the same name
 * in another case; the nearest name within an edit distance of a third of its length (at least 1).
 */
export function suggestColumn(written: string, field: string, columns: ColumnInfo[]): Suggestion | null {
  const suggest = (c: ColumnInfo, reason: Suggestion["reason"], extra = ""): Suggestion => {
    const write = escapeField(c.name);
    return { column: c.name, reason, write, text: `Did you mean ${tick(write)}${extra}?` };
  };
  const raw = written.trim();
  const byHeader = columns.find((c) => c.header != null && c.header.trim() === raw && c.header.trim() !== "" && c.name !== raw);
  if (byHeader) return suggest(byHeader, "header", madeFrom(byHeader));
  const split = parseHeaderUnit(raw);
  if (split.unit !== null && split.name !== raw) {
    const c = columns.find((x) => x.name === split.name);
    if (c) {
      const extra = madeFrom(c) || (c.unit ? ` (units are split off headers: ${tick(raw)} becomes the column ${tick(c.name)} with unit ${c.unit})` : "");
      return suggest(c, "unit", extra);
    }
  }
  const unescaped = written.replace(/\\(.)/g, "$1");
  const dotted = columns.find((c) => c.name === unescaped && c.name !== field);
  if (dotted) return suggest(dotted, "escape", ` (a ${tick(".")} or ${tick("[")} in a field reads a nested property unless escaped with a backslash)`);
  const lower = field.toLowerCase();
  const sameCase = columns.find((c) => c.name.toLowerCase() === lower);
  if (sameCase) return suggest(sameCase, "case", " (field names are case-sensitive)");
  let best: { c: ColumnInfo; d: number } | null = null;
  for (const c of columns) {
    const d = editDistance(lower, c.name.toLowerCase());
    if (d <= Math.max(1, Math.floor(field.length / 3)) && (!best || d < best.d)) best = { c, d };
  }
  return best ? suggest(best.c, "near") : null;
}

/**
 * The fields of `spec` that the columns bound under their data name do not have. Data names not
 * in `columnsByName` (unbound, inline) are not checked. One problem per data name and field (the
 * first place it is used).
 */
export function checkSpecFields(spec: unknown, columnsByName: Record<string, ColumnInfo[]>): FieldProblem[] {
  const problems: FieldProblem[] = [];
  const reported = new Set<string>();
  for (const u of specFieldUses(spec)) {
    const columns = columnsByName[u.dataName];
    if (!columns || columns.some((c) => c.name === u.field)) continue;
    const key = JSON.stringify([u.dataName, u.field]);
    if (reported.has(key)) continue;
    reported.add(key);
    const names = columns.map((c) => c.name);
    const suggestion = suggestColumn(u.written, u.field, columns);
    const what = u.written === u.field ? tick(u.field) : `${tick(u.written)} (column ${tick(u.field)})`;
    problems.push({
      dataName: u.dataName,
      field: u.field,
      written: u.written,
      channel: u.channel,
      path: formatPath(u.path),
      pointer: toPointer(u.path),
      columns: names,
      suggestion,
      message: `the field ${what} is not a column of the data ${tick(u.dataName)} (${listColumns(names)}).${suggestion ? ` ${suggestion.text}` : ""}`,
    });
  }
  return problems;
}

/** Whether a missing field in this place leaves the plot (or its layer) with nothing to draw. */
export function blanksPlot(channel: string): boolean {
  return POSITION.has(channel) || channel === "filter";
}
