/** The parse check: each raw and derived file parsed again and compared with the record of its parse at upload. */
import "server-only";
import type { ParsedTable, ParseOptions } from "@/lib/data/parse";
import type { IngestJob } from "../../datasets/ingest-in-child";
import { type BundleParseRecord } from "../bundle-layout";
import { reparseInChild } from "../reparse-in-child";
import { type VerifyRow } from "./common";

/** The parse options the application used for a file, from its record (format, delimiter and decimal mark as detected or chosen). */
function parseOptionsOf(rec: BundleParseRecord): IngestJob["options"] {
  return {
    format: rec.format as ParseOptions["format"],
    ...(rec.delimiter ? { delimiter: rec.delimiter as ParseOptions["delimiter"] } : {}),
    decimal: rec.decimal as ParseOptions["decimal"],
  };
}

/** A raw or derived file parsed again (in the ingest child, as at upload) and compared with the record of its parse. */
export async function parseRow(
  path: string,
  rec: BundleParseRecord,
  bytes: Uint8Array | undefined,
  dir: string,
): Promise<{ row: VerifyRow; table?: ParsedTable }> {
  if (!bytes) return { row: { item: path, check: "parse", match: false, detail: "missing from the zip" } };
  let parsed: Awaited<ReturnType<typeof reparseInChild>>;
  try {
    parsed = await reparseInChild(bytes, rec.fileName, parseOptionsOf(rec), dir);
  } catch (err) {
    return { row: { item: path, check: "parse", match: false, detail: `does not parse: ${(err as Error).message}` } };
  }
  const { described: d, table } = parsed;
  const diffs: string[] = [];
  const same = (what: string, recorded: unknown, again: unknown) => {
    if (JSON.stringify(recorded) !== JSON.stringify(again)) diffs.push(`${what}: recorded ${JSON.stringify(recorded)}, parsed ${JSON.stringify(again)}`);
  };
  same("format", rec.format, d.parseInfo.format);
  same("encoding", rec.encoding, d.parseInfo.encoding);
  same("delimiter", rec.delimiter, d.parseInfo.delimiter);
  same("decimal mark", rec.decimal, d.parseInfo.decimal);
  same("rows", rec.rowCount, d.rowCount);
  same(
    "columns",
    rec.columns.map((c) => [c.name, c.unit, c.type, ...(c.header === undefined ? [] : [c.header])]),
    d.columns.map((c, i) => [c.name, c.unit, c.type, ...(rec.columns[i]?.header === undefined ? [] : [c.header])]),
  );
  same("warnings", rec.warnings, d.parseInfo.warnings);
  const summaries = new Map(rec.summary.map((s) => [s.column, s]));
  for (const s of d.summary) {
    const r = summaries.get(s.column);
    same(`column ${s.column} statistics`, r && [r.count, r.missing, r.min, r.max, r.mean, r.sd], [s.count, s.missing, s.min, s.max, s.mean, s.sd]);
  }
  const detail = diffs.length
    ? diffs.join("; ")
    : `${d.parseInfo.format}, ${d.columns.length} columns × ${d.rowCount} rows, statistics of ${summaries.size} numeric columns as recorded`;
  return { row: { item: path, check: "parse", match: diffs.length === 0, detail }, table };
}
