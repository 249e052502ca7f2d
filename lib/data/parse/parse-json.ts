/**
 * JSON tables: an array of records (`[{"t": 0, "y": 1}, …]`), `{columns, rows}` (rows may also
 * be called `data`), column arrays (`{"t": [...], "y": [...]}`), or an array of arrays whose
 * first row may hold the names. Other top-level scalars and a `metadata` object become metadata.
 */
import type { ColumnType, ParsedColumn, ParsedTable, ParseOptions } from "./types";
import { DEFAULT_MAX_COLUMNS } from "./types";
import type { DecodedText } from "./decode-bytes";
import { checkHeader } from "./build-columns";
import { formatCount } from "../format";
import { describeLocation, fail, ParseError, quote } from "./parse-error";
import { parseCell } from "./parse-cell";
import { setOwn } from "./header-block";
import { parseHeaderUnit } from "../units";
import { findJsonSyntaxError, lineColumnAt, locateJsonPath } from "./json-syntax";

type Path = Array<string | number>;

/** Arrays and objects inside one another; a table needs three or four, metadata a few more. */
const MAX_JSON_NESTING = 64;

/**
 * Path of the first array or object nested deeper than `max` (the root is level 1), or null.
 * An explicit stack, never recursion: JSON.parse accepts any depth, but later recursive steps
 * (JSON.stringify of a cell, for one) would overflow the call stack.
 */
function findDeepNesting(root: unknown, max: number): Path | null {
  interface Frame {
    value: object;
    depth: number;
    parent: Frame | null;
    key: string | number;
  }
  if (root === null || typeof root !== "object") return null;
  const stack: Frame[] = [{ value: root, depth: 1, parent: null, key: "" }];
  while (stack.length) {
    const f = stack.pop()!;
    if (f.depth > max) {
      const path: Path = [];
      for (let g: Frame | null = f; g && g.parent; g = g.parent) path.push(g.key);
      return path.reverse();
    }
    if (Array.isArray(f.value)) {
      const arr: unknown[] = f.value;
      for (let i = arr.length - 1; i >= 0; i--) {
        const v = arr[i];
        if (v !== null && typeof v === "object") stack.push({ value: v, depth: f.depth + 1, parent: f, key: i });
      }
    } else {
      const keys = Object.keys(f.value);
      for (let i = keys.length - 1; i >= 0; i--) {
        const v = (f.value as Record<string, unknown>)[keys[i]];
        if (v !== null && typeof v === "object") stack.push({ value: v, depth: f.depth + 1, parent: f, key: keys[i] });
      }
    }
  }
  return null;
}

interface RawColumn {
  header: string;
  unit?: string | null;
  values: unknown[];
  /** JSON path of the value in row r, for error locations. */
  pathOf: (r: number) => Path;
}

interface Shape {
  columns: RawColumn[];
  rowCount: number;
  metadata: Record<string, string>;
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

function toText(v: unknown): string {
  if (v === null || v === undefined) return "";
  if (typeof v === "string") return v;
  return typeof v === "number" || typeof v === "boolean" ? String(v) : JSON.stringify(v);
}

export function parseJson(decoded: DecodedText, opts: ParseOptions): ParsedTable {
  const { fileName } = opts;
  const text = decoded.text;
  let root: unknown;
  try {
    root = JSON.parse(text);
  } catch (e) {
    const found = findJsonSyntaxError(text);
    const offset = found?.offset ?? 0;
    const { line, column } = lineColumnAt(text, offset);
    const problem = found?.problem ?? (e as Error).message;
    fail("bad_json", fileName, { line, column }, `the JSON is malformed: ${problem}.`);
  }
  const at = (path: Path) => {
    const off = locateJsonPath(text, path);
    return off < 0 ? {} : lineColumnAt(text, off);
  };
  const deep = findDeepNesting(root, MAX_JSON_NESTING);
  if (deep) fail("bad_json", fileName, at(deep), `the JSON nests arrays and objects more than ${MAX_JSON_NESTING} levels deep.`);
  const shape = toShape(root, fileName, at);
  const maxColumns = opts.maxColumns ?? DEFAULT_MAX_COLUMNS;
  if (shape.columns.length > maxColumns) {
    fail("too_many_columns", fileName, {}, `${formatCount(shape.columns.length)} columns is more than the limit of ${formatCount(maxColumns)}.`);
  }
  if (shape.columns.length === 0 || shape.rowCount === 0) fail("empty", fileName, {}, "the JSON holds no data rows.");
  checkHeader(
    shape.columns.map((c) => c.header),
    { fileName },
  );

  const warnings = [...decoded.warnings];
  const columns: ParsedColumn[] = [];
  const data: Array<Float64Array | string[]> = [];
  for (const raw of shape.columns) {
    const { type, values, missing } = typeColumn(raw, shape.rowCount, fileName, at);
    const parsed = parseHeaderUnit(raw.header);
    const unit = raw.unit !== undefined ? raw.unit : parsed.unit;
    const name = raw.unit !== undefined ? raw.header : parsed.name;
    columns.push({ name, unit, type, sourceHeader: raw.header });
    data.push(values);
    if (missing > 0) warnings.push(`${formatCount(missing)} missing value${missing === 1 ? "" : "s"} in ${quote(name)} read as NaN`);
  }
  if (!columns.some((c) => c.type === "number")) {
    fail("no_numeric_column", fileName, {}, "no column holds numbers; at least one numeric column is needed.");
  }
  return {
    format: "json",
    encoding: decoded.encoding,
    delimiter: null,
    decimal: ".",
    columns,
    data,
    rowCount: shape.rowCount,
    headerLines: [],
    metadata: shape.metadata,
    warnings,
  };
}

type Locate = (path: Path) => { line?: number; column?: number };

function shapeError(fileName: string, where: { line?: number; column?: number }, what: string): never {
  throw new ParseError("bad_json", `${describeLocation(fileName, where)}: ${what}`, fileName, where);
}

function toShape(root: unknown, fileName: string, at: Locate): Shape {
  const metadata: Record<string, string> = {};
  if (Array.isArray(root)) return fromArray(root, [], metadata, fileName, at);
  if (!isRecord(root)) shapeError(fileName, at([]), "the JSON is a single value, not a table (expected an array of records or {columns, rows}).");
  for (const [k, v] of Object.entries(root)) {
    if (k === "metadata" && isRecord(v)) for (const [mk, mv] of Object.entries(v)) setOwn(metadata, mk, toText(mv));
    else if (v === null || typeof v !== "object") setOwn(metadata, k, toText(v));
  }
  const rows = Array.isArray(root.rows) ? "rows" : Array.isArray(root.data) ? "data" : null;
  if (Array.isArray(root.columns) && rows) {
    const names = root.columns.map((c, j) => columnHeader(c, j, fileName, at));
    const body = root[rows] as unknown[];
    body.forEach((r, i) => {
      if (!Array.isArray(r) || r.length !== names.length) {
        const found = Array.isArray(r) ? `${r.length} values` : "not an array";
        fail("ragged", fileName, at([rows, i]), `row ${i + 1} has ${found}, but "columns" names ${names.length}.`);
      }
    });
    const columns = names.map((n, j): RawColumn => ({ ...n, values: body.map((r) => (r as unknown[])[j]), pathOf: (r) => [rows, r, j] }));
    return { columns, rowCount: body.length, metadata };
  }
  if (rows && !Array.isArray(root.columns)) return fromArray(root[rows] as unknown[], [rows], metadata, fileName, at);
  const arrays = Object.entries(root).filter(([, v]) => Array.isArray(v)) as Array<[string, unknown[]]>;
  if (arrays.length === 0) shapeError(fileName, at([]), "the JSON object holds no table (expected {columns, rows}, records or column arrays).");
  const rowCount = arrays[0][1].length;
  for (const [k, v] of arrays) {
    if (v.length !== rowCount)
      fail("ragged", fileName, { ...at([k]), columnName: k }, `column ${quote(k)} has ${v.length} values, but ${quote(arrays[0][0])} has ${rowCount}.`);
  }
  return { columns: arrays.map(([k, v]) => ({ header: k, values: v, pathOf: (r) => [k, r] })), rowCount, metadata };
}

function columnHeader(c: unknown, j: number, fileName: string, at: Locate): { header: string; unit?: string | null } {
  if (typeof c === "string") return { header: c };
  if (isRecord(c) && typeof c.name === "string") return { header: c.name, unit: typeof c.unit === "string" && c.unit !== "" ? c.unit : null };
  return shapeError(fileName, at(["columns", j]), `column ${j + 1} in "columns" must be a name or {"name", "unit"}.`);
}

function fromArray(arr: unknown[], base: Path, metadata: Record<string, string>, fileName: string, at: Locate): Shape {
  if (arr.length === 0) fail("empty", fileName, {}, "the JSON array is empty.");
  if (arr.every(isRecord)) {
    const keys = new Map<string, number>();
    for (const rec of arr) for (const k of Object.keys(rec)) if (!keys.has(k)) keys.set(k, keys.size);
    const columns = [...keys.keys()].map((k): RawColumn => ({
      header: k,
      values: arr.map((rec) => (Object.hasOwn(rec, k) ? rec[k] : null)),
      pathOf: (r) => [...base, r, k],
    }));
    return { columns, rowCount: arr.length, metadata };
  }
  if (arr.every(Array.isArray)) {
    const rows = arr as unknown[][];
    const hasHeader = rows[0].length > 0 && rows[0].every((v) => typeof v === "string" && parseCell(v, false) === undefined);
    const width = rows[0].length;
    rows.forEach((r, i) => {
      if (r.length !== width) fail("ragged", fileName, at([...base, i]), `row ${i + 1} has ${r.length} values, but row 1 has ${width}.`);
    });
    const body = hasHeader ? rows.slice(1) : rows;
    const off = hasHeader ? 1 : 0;
    const columns = Array.from({ length: width }, (_, j): RawColumn => ({
      header: hasHeader ? String(rows[0][j]) : `col${j + 1}`,
      values: body.map((r) => r[j]),
      pathOf: (r) => [...base, r + off, j],
    }));
    return { columns, rowCount: body.length, metadata };
  }
  if (arr.every((v) => v === null || typeof v !== "object")) {
    return { columns: [{ header: "value", values: arr, pathOf: (r) => [...base, r] }], rowCount: arr.length, metadata };
  }
  const bad = arr.findIndex((v) => !isRecord(v));
  return shapeError(fileName, at([...base, bad]), `element ${bad + 1} of the array is not a record like the others.`);
}

/** Numbers (or numeric strings) make a numeric column unless text cells outnumber them. */
function typeColumn(raw: RawColumn, rows: number, fileName: string, at: Locate): { type: ColumnType; values: Float64Array | string[]; missing: number } {
  const nums = new Float64Array(rows);
  let numeric = 0;
  let missing = 0;
  let firstBad = -1;
  let badCount = 0;
  for (let r = 0; r < rows; r++) {
    const v = raw.values[r];
    const n = typeof v === "number" ? v : typeof v === "string" ? parseCell(v, false) : v === null || v === undefined ? NaN : undefined;
    if (n === undefined) {
      if (firstBad < 0) firstBad = r;
      badCount++;
      nums[r] = NaN;
    } else if (Number.isNaN(n)) {
      missing++;
      nums[r] = NaN;
    } else {
      numeric++;
      nums[r] = n;
    }
  }
  if (badCount > numeric) return { type: "string", values: raw.values.map(toText), missing: 0 };
  if (badCount > 0) {
    const where = at(raw.pathOf(firstBad));
    const more = badCount > 1 ? ` apart from ${formatCount(badCount - 1)} more such value${badCount === 2 ? "" : "s"}` : "";
    fail(
      "non_numeric",
      fileName,
      { ...where, columnName: raw.header },
      `row ${firstBad + 1} holds ${quote(toText(raw.values[firstBad]))}, which is not a number; the rest of this column is numeric${more}.`,
    );
  }
  return { type: "number", values: nums, missing };
}
