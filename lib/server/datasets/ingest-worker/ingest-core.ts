/**
 * One ingest job, as the ingest child process runs it: read the uploaded file from disk, parse it,
 * summarise its numeric columns, encode the columnar cache and write it to the path it was given.
 * Only the small description of the table goes back to the server; the bytes, the parsed columns
 * and the encoded cache live and die in the child, so the server's memory does not grow with the file.
 *
 * Relative imports only: the child runs this file through tsx, outside Next's bundler.
 */
import "server-only";
import fs from "node:fs";
import type { ParseInfo, StoredSummary } from "@/db/schema";
import { encodeColumnar } from "../../../data/columnar";
import { ParseError, parseTable, type ParsedTable, type ParseOptions } from "../../../data/parse";
import type { ParseErrorCode } from "../../../data/parse/parse-error";
import type { ColumnType } from "../../../data/parse/types";
import { summarizeColumn } from "../../../data/summary";

export interface IngestJob {
  /** The uploaded file (a temporary part file, or a stored blob when a cache is rebuilt). */
  input: string;
  /** Where the columnar cache goes; created here (it must not exist), renamed into place by the server. */
  output: string;
  fileName: string;
  options: Pick<ParseOptions, "delimiter" | "decimal" | "format">;
}

export interface IngestedTable {
  rowCount: number;
  columns: Array<{ name: string; unit: string | null; type: ColumnType; header: string }>;
  parseInfo: ParseInfo;
  summary: StoredSummary[];
}

/** Why a job failed: the file's own fault (with its location), the memory budget, or anything else. */
export type IngestFailure =
  | { kind: "parse"; code: ParseErrorCode; message: string; fileName: string; line?: number; column?: number; columnName?: string }
  | { kind: "memory"; message: string }
  | { kind: "failed"; message: string };

function summarise(t: ParsedTable): StoredSummary[] {
  return t.columns.flatMap((c, i) => {
    if (c.type !== "number") return [];
    const s = summarizeColumn(t.data[i] as Float64Array);
    const fin = (v: number) => (Number.isFinite(v) ? v : null);
    return [{ column: c.name, unit: c.unit, count: s.count, missing: s.missing, min: fin(s.min), max: fin(s.max), mean: fin(s.mean), sd: fin(s.sd) }];
  });
}

function describe(table: ParsedTable): IngestedTable {
  return {
    rowCount: table.rowCount,
    columns: table.columns.map((c) => ({ name: c.name, unit: c.unit, type: c.type, header: c.sourceHeader })),
    parseInfo: {
      format: table.format,
      encoding: table.encoding,
      delimiter: table.delimiter,
      decimal: table.decimal,
      warnings: table.warnings,
      headerMetadata: table.metadata,
    },
    summary: summarise(table),
  };
}

function readTable(job: IngestJob): ParsedTable {
  const buf = fs.readFileSync(job.input);
  // A plain Uint8Array view: Buffer#slice returns a view where the parser expects Uint8Array#slice's copy.
  return parseTable(new Uint8Array(buf.buffer, buf.byteOffset, buf.byteLength), { fileName: job.fileName, ...job.options });
}

/** V8's own words when an ArrayBuffer, array or string cannot be made as large as the file needs. */
const ALLOCATION_FAILED = /allocation failed|invalid (typed )?array length|invalid string length/i;

/** Runs one job; never throws. The cache file exists only when the result is ok. */
export function runIngestJob(job: IngestJob): { ok: true; table: IngestedTable } | { ok: false; error: IngestFailure } {
  try {
    const table = readTable(job);
    const described = describe(table);
    fs.writeFileSync(job.output, encodeColumnar(table), { flag: "wx" });
    return { ok: true, table: described };
  } catch (err) {
    fs.rmSync(job.output, { force: true });
    if (err instanceof ParseError) {
      const { code, message, fileName, line, column, columnName } = err;
      return { ok: false, error: { kind: "parse", code, message, fileName, line, column, columnName } };
    }
    const message = err instanceof Error ? err.message : String(err);
    if (err instanceof RangeError && ALLOCATION_FAILED.test(message)) return { ok: false, error: { kind: "memory", message } };
    return { ok: false, error: { kind: "failed", message } };
  }
}
