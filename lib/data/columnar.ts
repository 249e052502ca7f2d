/**
 * The derived cache stored beside a raw upload: a ParsedTable as one binary blob that can be
 * paged without decoding everything.
 *
 * Layout (all integers little-endian):
 *   "PLC1" | u32 header length H | header JSON (UTF-8, H bytes) | zero padding to 8 | blocks
 * Block offsets in the header are relative to the end of that padding. A numeric column is
 * rowCount × float64. A string column is (rowCount + 1) × u32 byte offsets followed by the
 * UTF-8 bytes of all cells; this (rather than one JSON array) lets readRows fetch rows
 * 900,000…900,099 by touching only those bytes.
 */
import type { ParsedColumn, ParsedTable } from "./parse/types";

const MAGIC = [0x50, 0x4c, 0x43, 0x31]; // "PLC1"
const VERSION = 1;

interface BlockInfo {
  offset: number;
  byteLength: number;
}

export interface ColumnarHeader extends Omit<ParsedTable, "data" | "columns"> {
  version: number;
  columns: Array<ParsedColumn & BlockInfo>;
}

const LITTLE_ENDIAN = new Uint8Array(new Float64Array([1]).buffer)[7] === 0x3f;

function pad8(n: number): number {
  return (n + 7) & ~7;
}

function utf8Length(s: string): number {
  let n = 0;
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c < 0x80) n += 1;
    else if (c < 0x800) n += 2;
    else if (c >= 0xd800 && c <= 0xdbff && i + 1 < s.length && (s.charCodeAt(i + 1) & 0xfc00) === 0xdc00) {
      n += 4;
      i++;
    } else n += 3; // BMP character, or a lone surrogate that the encoder writes as U+FFFD
  }
  return n;
}

function floatBytes(col: Float64Array): Uint8Array {
  if (LITTLE_ENDIAN) return new Uint8Array(col.buffer, col.byteOffset, col.byteLength);
  const out = new Uint8Array(col.length * 8);
  const view = new DataView(out.buffer);
  for (let i = 0; i < col.length; i++) view.setFloat64(i * 8, col[i], true);
  return out;
}

function stringBlock(col: string[]): Uint8Array {
  const n = col.length;
  const lengths = col.map(utf8Length);
  const total = lengths.reduce((a, b) => a + b, 0);
  const out = new Uint8Array(4 * (n + 1) + total);
  const view = new DataView(out.buffer);
  const encoder = new TextEncoder();
  let pos = 0;
  for (let i = 0; i < n; i++) {
    view.setUint32(4 * i, pos, true);
    encoder.encodeInto(col[i], out.subarray(4 * (n + 1) + pos));
    pos += lengths[i];
  }
  view.setUint32(4 * n, pos, true);
  return out;
}

export function encodeColumnar(table: ParsedTable): Uint8Array {
  const blocks = table.data.map((d) => (d instanceof Float64Array ? floatBytes(d) : stringBlock(d)));
  let offset = 0;
  const columns = table.columns.map((c, j) => {
    const info = { ...c, offset, byteLength: blocks[j].byteLength };
    offset += pad8(blocks[j].byteLength);
    return info;
  });
  const header: ColumnarHeader = { version: VERSION, ...tableInfo(table), columns };
  const json = new TextEncoder().encode(JSON.stringify(header));
  const base = pad8(8 + json.byteLength);
  const out = new Uint8Array(base + offset);
  out.set(MAGIC, 0);
  new DataView(out.buffer).setUint32(4, json.byteLength, true);
  out.set(json, 8);
  columns.forEach((c, j) => out.set(blocks[j], base + c.offset));
  return out;
}

/** Everything of a table except its columns and data. */
function tableInfo(t: Omit<ParsedTable, "data" | "columns">): Omit<ParsedTable, "data" | "columns"> {
  return {
    format: t.format,
    encoding: t.encoding,
    delimiter: t.delimiter,
    decimal: t.decimal,
    rowCount: t.rowCount,
    headerLines: t.headerLines,
    metadata: t.metadata,
    warnings: t.warnings,
  };
}

function parseHeader(blob: Uint8Array): { header: ColumnarHeader; base: number } {
  if (blob.length < 8 || MAGIC.some((b, i) => blob[i] !== b)) throw new Error("not a Prooflight columnar blob (bad magic)");
  const len = new DataView(blob.buffer, blob.byteOffset, blob.byteLength).getUint32(4, true);
  const header = JSON.parse(new TextDecoder().decode(blob.subarray(8, 8 + len))) as ColumnarHeader;
  if (header.version !== VERSION) throw new Error(`unsupported columnar blob version ${header.version}`);
  return { header, base: pad8(8 + len) };
}

/** The header alone: column names, units, types, row count, metadata — no column data. */
export function readColumnarHeader(blob: Uint8Array): ColumnarHeader {
  return parseHeader(blob).header;
}

function readFloats(blob: Uint8Array, start: number, count: number): Float64Array {
  const bytes = blob.slice(start, start + count * 8); // a fresh, aligned copy
  if (LITTLE_ENDIAN) return new Float64Array(bytes.buffer);
  const view = new DataView(bytes.buffer);
  return Float64Array.from({ length: count }, (_, i) => view.getFloat64(i * 8, true));
}

function readStrings(blob: Uint8Array, start: number, rowCount: number, from: number, count: number): string[] {
  const view = new DataView(blob.buffer, blob.byteOffset, blob.byteLength);
  const text = start + 4 * (rowCount + 1);
  const decoder = new TextDecoder();
  const out = new Array<string>(count);
  let a = view.getUint32(start + 4 * from, true);
  for (let i = 0; i < count; i++) {
    const b = view.getUint32(start + 4 * (from + i + 1), true);
    out[i] = decoder.decode(blob.subarray(text + a, text + b));
    a = b;
  }
  return out;
}

function stripBlock(c: ParsedColumn & BlockInfo): ParsedColumn {
  return { name: c.name, unit: c.unit, type: c.type, sourceHeader: c.sourceHeader };
}

export interface RowPage {
  columns: ParsedColumn[];
  /** Rows in the whole table. */
  rowCount: number;
  /** First row of this page and the number of rows in it. */
  offset: number;
  length: number;
  data: Array<Float64Array | string[]>;
}

/** Rows [offset, offset + limit) of every column, clamped to the table; cost ∝ limit. */
export function readRows(blob: Uint8Array, offset: number, limit: number): RowPage {
  const { header, base } = parseHeader(blob);
  const from = Math.min(Math.max(0, Math.floor(offset)), header.rowCount);
  const count = Math.max(0, Math.min(Math.floor(limit), header.rowCount - from));
  const data = header.columns.map((c) =>
    c.type === "number" ? readFloats(blob, base + c.offset + 8 * from, count) : readStrings(blob, base + c.offset, header.rowCount, from, count),
  );
  return { columns: header.columns.map(stripBlock), rowCount: header.rowCount, offset: from, length: count, data };
}

export function decodeColumnar(blob: Uint8Array): ParsedTable {
  const { header } = parseHeader(blob);
  const page = readRows(blob, 0, header.rowCount);
  return { ...tableInfo(header), columns: page.columns, data: page.data };
}
