/**
 * A structural comparison of two JSON values (spec trees): one raw change per added, removed or
 * changed place, with list items matched by identity so an inserted layer is one addition.
 */

export type SpecChangeKind = "added" | "removed" | "changed";

export type Seg = string | number;
export interface RawChange {
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

export const TRANSFORM_OPS = [
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

/** Above this many cells the elements of two arrays are compared by position instead of matched. */
const MAX_MATCH_CELLS = 250_000;

export const isObject = (v: unknown): v is Record<string, unknown> => typeof v === "object" && v !== null && !Array.isArray(v);

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
export function keyOf(v: unknown): string {
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

/** Every raw change from `a` to `b`, in reading order. */
export function diffJson(a: unknown, b: unknown): RawChange[] {
  const out: RawChange[] = [];
  diff(a, b, [], out);
  return out;
}
