/**
 * The builder's record in a spec: which template made it and with which options, kept at
 * `usermeta.template` = `{ id, options }` (Vega-Lite passes usermeta through untouched; the
 * renderers drop it). A revision saved from the builder carries it, and so does one saved later
 * from the spec editor (the record is part of the text), so opening a panel can load the builder
 * as it was and tell the hand edits apart: the spec the template builds from the recorded options
 * is compared structurally with the saved one, and every place that differs is a hand edit the
 * builder keeps (rebasing it onto what new options build) and no longer controls.
 */
import type { TopLevelSpec } from "vega-lite";
import { formatPath } from "./spec-path";
import { diffJson, isObject, type RawChange, type Seg } from "./spec-structural-diff";
import type { FigureTemplate, TemplateOptionField } from "./plots/types";

/** The key under `usermeta` (allowed, with its own nesting limit, by ./spec-security). */
const TEMPLATE_RECORD_KEY = "template";

export interface TemplateRecord {
  id: string;
  options: Record<string, unknown>;
}

/** The record a spec carries, or null (written by hand, or saved before the builder recorded itself). */
export function readTemplateRecord(spec: unknown): TemplateRecord | null {
  if (!isObject(spec) || !isObject(spec.usermeta)) return null;
  const t = spec.usermeta[TEMPLATE_RECORD_KEY];
  if (!isObject(t) || typeof t.id !== "string" || !isObject(t.options)) return null;
  return { id: t.id, options: t.options };
}

/** The spec without the record (and without `usermeta` if nothing else was in it). */
export function withoutTemplateRecord(spec: unknown): unknown {
  if (!isObject(spec) || !isObject(spec.usermeta) || !(TEMPLATE_RECORD_KEY in spec.usermeta)) return spec;
  const meta = Object.fromEntries(Object.entries(spec.usermeta).filter(([k]) => k !== TEMPLATE_RECORD_KEY));
  const rest = Object.fromEntries(Object.entries(spec).filter(([k]) => k !== "usermeta"));
  return Object.keys(meta).length ? { ...rest, usermeta: meta } : rest;
}

/** The spec with the record written into its usermeta (options as JSON: undefined entries dropped). */
export function withTemplateRecord(spec: TopLevelSpec | Record<string, unknown>, record: TemplateRecord): Record<string, unknown> {
  const s = spec as Record<string, unknown>;
  const meta = isObject(s.usermeta) ? s.usermeta : {};
  const options = JSON.parse(JSON.stringify(record.options)) as Record<string, unknown>;
  return { ...s, usermeta: { ...meta, [TEMPLATE_RECORD_KEY]: { id: record.id, options } } };
}

/** A hand edit: a place where the saved spec differs from what its template builds from the recorded options. */
export interface HandEdit extends RawChange {
  /** `layer[0].encoding.x.title`, as the spec editor shows paths. */
  where: string;
}

/** The hand edits of a saved spec against what `template` builds from `options` (the record left out of both). */
export function handEditsOf(template: FigureTemplate<any>, options: Record<string, unknown>, saved: unknown): HandEdit[] {
  return diffJson(template.build(options), withoutTemplateRecord(saved)).map((c) => ({ ...c, where: formatPath(c.path) }));
}

const clone = <T>(v: T): T => (v === undefined ? v : (JSON.parse(JSON.stringify(v)) as T));

function at(node: unknown, path: Seg[]): unknown {
  let cur = node;
  for (const seg of path) {
    if (Array.isArray(cur) && typeof seg === "number") cur = cur[seg];
    else if (isObject(cur) && typeof seg === "string") cur = cur[seg];
    else return undefined;
  }
  return cur;
}

/** What makes two views "the same one": mark type and data name (both absent counts as the same). */
function viewKey(v: unknown): string {
  if (!isObject(v)) return "";
  const mark = isObject(v.mark) ? v.mark.type : v.mark;
  return `${typeof mark === "string" ? mark : ""}|${isObject(v.data) && typeof v.data.name === "string" ? v.data.name : ""}`;
}

/** Every list element on the way to `path` is the same view in `reference` and `target`. */
function sameViewsAlong(reference: unknown, target: unknown, path: Seg[]): boolean {
  for (let i = 0; i < path.length - 1; i++) {
    if (typeof path[i] !== "number") continue;
    const prefix = path.slice(0, i + 1);
    if (viewKey(at(reference, prefix)) !== viewKey(at(target, prefix))) return false;
  }
  return true;
}

/**
 * Hand edits (`saved` against `base`, what the template built from the recorded options) carried
 * over to `target`, what it builds from new options: each edit is written at its place when the
 * place still exists and holds the same view; the others are returned as `lost`.
 */
export function rebaseHandEdits(base: unknown, saved: unknown, target: unknown, edits: HandEdit[]): { spec: unknown; lost: HandEdit[] } {
  const out = clone(target);
  const lost: HandEdit[] = [];
  // Removals name places in `base`; from the last to the first, so earlier list positions hold.
  const removals = edits.filter((e) => e.kind === "removed").reverse();
  const writes = edits.filter((e) => e.kind !== "removed");
  for (const e of writes) {
    const parent = at(out, e.path.slice(0, -1));
    const key = e.path[e.path.length - 1];
    if (!sameViewsAlong(base, out, e.path) && !sameViewsAlong(withoutTemplateRecord(saved), out, e.path)) lost.push(e);
    else if (isObject(parent) && typeof key === "string") parent[key] = clone(e.after);
    else if (Array.isArray(parent) && typeof key === "number" && key <= parent.length) {
      if (e.kind === "added") parent.splice(key, 0, clone(e.after));
      else if (key < parent.length) parent[key] = clone(e.after);
      else lost.push(e);
    } else lost.push(e);
  }
  for (const e of removals) {
    const parent = at(out, e.path.slice(0, -1));
    const key = e.path[e.path.length - 1];
    if (!sameViewsAlong(base, out, e.path)) lost.push(e);
    else if (isObject(parent) && typeof key === "string" && key in parent) delete parent[key];
    else if (Array.isArray(parent) && typeof key === "number" && key < parent.length) parent.splice(key, 1);
    else lost.push(e);
  }
  return { spec: out, lost };
}

/** A different value of the same kind, to see which places of the spec an option moves. */
function probe(field: TemplateOptionField, value: unknown): unknown {
  switch (field.kind) {
    case "text":
    case "column":
      return `${typeof value === "string" ? value : ""}\u2063probe`;
    case "number":
      return (typeof value === "number" ? value : (field.default ?? 1)) * 1.5 + 1;
    case "boolean":
      return !(value ?? field.default);
    case "select":
      return field.choices.find((c) => c.value !== (value ?? field.default))?.value;
    case "markers":
      return [...((value as unknown[] | undefined) ?? field.default), { position: 1234.5, label: "probe" }];
    default:
      return undefined;
  }
}

const covers = (edit: string, place: string) => place === edit || place.startsWith(`${edit}.`) || place.startsWith(`${edit}[`);

/**
 * The builder fields whose every effect on the drawing is overwritten by a hand edit: changing them
 * would change nothing drawn. `fields` are the template's options (print fields included, `print.*`).
 */
export function fieldsOverridden(template: FigureTemplate<any>, options: Record<string, unknown>, fields: TemplateOptionField[], edits: HandEdit[]): string[] {
  if (!edits.length) return [];
  const built = template.build(options);
  const places = edits.map((e) => e.where);
  const out: string[] = [];
  for (const f of fields) {
    if (f.kind === "data-name") continue;
    const [head, sub] = f.key.split(".");
    const current = sub ? (isObject(options[head]) ? options[head][sub] : undefined) : options[f.key];
    const value = probe(f, current);
    if (value === undefined) continue;
    const probed = sub ? { ...options, [head]: { ...(isObject(options[head]) ? options[head] : {}), [sub]: value } } : { ...options, [f.key]: value };
    let moved: string[];
    try {
      // The spec's top-level description (read by screen readers, not drawn) follows the names; the drawing decides.
      moved = diffJson(built, template.build(probed))
        .map((c) => formatPath(c.path))
        .filter((m) => m !== "description");
    } catch {
      continue;
    }
    if (moved.length && moved.every((m) => places.some((p) => covers(p, m)))) out.push(f.key);
  }
  return out;
}
