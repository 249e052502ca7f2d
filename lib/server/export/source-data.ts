import "server-only";
import { strToU8 } from "fflate";
import { inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { versions, type BoundInput } from "@/db/schema";
import { axisTitle } from "@/lib/data/format";
import type { RowTable } from "@/lib/data/table-rows";
import { loadBoundTables } from "../figures/bindings";
import type { FigureReview } from "../review/review-context";
import { ExportBody } from "./export-body";
import { utf8Blocks } from "./utf8-chunks";
import { ZipFileWriter } from "./zip-writer";

/** Text a spreadsheet would take for a formula if typed in: it starts with =, +, -, @, a tab or a CR. */
export function formulaLike(text: string): boolean {
  return /^[=+\-@\t\r]/.test(text);
}

/**
 * Text a spreadsheet would run as a formula (=, +, -, @, tab or CR first) gets a leading
 * apostrophe, so opening the source data never evaluates a cell; numbers are written as they are.
 */
export function csvCell(v: unknown): string {
  if (v === null || v === undefined) return "";
  // Cells are JSON values: text, numbers, booleans (an object or list is written as its JSON).
  let s = typeof v === "string" ? v : typeof v === "number" || typeof v === "boolean" ? String(v) : JSON.stringify(v);
  if (typeof v !== "number" && formulaLike(s)) s = `'${s}`;
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** CSV with a header row (empty for a table without rows), in blocks; `units` names a column's unit, written into its header as "tau (µs)". */
export function tableToCsv(t: RowTable, units: Record<string, string | null> = {}): Iterable<Uint8Array> {
  return utf8Blocks(csvLines(t, units));
}

function* csvLines(t: RowTable, units: Record<string, string | null>): Generator<string> {
  if (!t.length) return;
  yield t.names.map((c) => csvCell(units[c] ? axisTitle(c, units[c]) : c)).join(",") + "\n";
  const cells = new Array<string>(t.names.length);
  for (let i = 0; i < t.length; i++) {
    for (let j = 0; j < cells.length; j++) cells[j] = csvCell(t.cell(i, j));
    yield cells.join(",") + "\n";
  }
}

/** Column units of the versions bound to a revision, by version id then column name. */
async function unitsOf(versionIds: string[]): Promise<Map<string, Record<string, string | null>>> {
  const ids = [...new Set(versionIds)];
  const rows = ids.length ? await getDb().select({ id: versions.id, columns: versions.columns }).from(versions).where(inArray(versions.id, ids)) : [];
  return new Map(rows.map((v) => [v.id, Object.fromEntries(v.columns.map((c) => [c.name, c.unit]))]));
}

/** One data name of a panel: what it binds, every row at full resolution (read from the parsed columns), and its columns' units by name. */
interface BoundTable {
  name: string;
  bound: BoundInput;
  table: RowTable;
  units: Record<string, string | null>;
}

/**
 * The data behind each panel of a figure, in figure order: the current revision (null before the
 * first) and, per data name, the rows it binds (never downsampled) with the units of their
 * columns. One panel is loaded at a time, so a writer holds one panel's columns (no object per row).
 */
export async function* panelSourceData(review: FigureReview): AsyncGenerator<{
  letter: string;
  revision: { number: number; contentHash: string; bound: Record<string, BoundInput> } | null;
  tables: BoundTable[];
}> {
  for (const p of review.panels) {
    const rev = p.revision;
    if (!rev) {
      yield { letter: p.letter, revision: null, tables: [] };
      continue;
    }
    const data = await loadBoundTables(rev.bound);
    const units = await unitsOf(Object.values(rev.bound).map((b) => b.versionId));
    const tables = Object.entries(data).map(([name, table]) => ({ name, bound: rev.bound[name], table, units: units.get(rev.bound[name].versionId) ?? {} }));
    yield { letter: p.letter, revision: rev, tables };
  }
}

/**
 * The per-figure source data journals ask for: one CSV per panel and data name, every point
 * (never downsampled), units in the column headers ("tau (µs)"), then a README naming each
 * file's origin by hash. Each file is made as it is read.
 */
export async function* sourceDataEntries(review: FigureReview): AsyncGenerator<{ name: string; content: Iterable<Uint8Array> }> {
  const readme = [`Source data for Figure ${review.figure.number}: ${review.figure.title}`, `Figure hash: ${review.figureHash}`, ""];
  for await (const p of panelSourceData(review)) {
    if (!p.revision) {
      readme.push(`Panel ${p.letter}: no revision yet.`);
      continue;
    }
    readme.push(`Panel ${p.letter} — revision ${p.revision.number}, content hash ${p.revision.contentHash}`);
    for (const { name, bound: b, table, units } of p.tables) {
      const file = `figure-${review.figure.number}-panel-${p.letter}-${name}.csv`;
      readme.push(`  ${file}: ${table.length} rows from ${b.kind} ${b.id}${b.output ? ` (${b.output})` : ""}, source sha256 ${b.sha256}`);
      yield { name: file, content: tableToCsv(table, units) };
    }
  }
  yield { name: "README.txt", content: [strToU8(readme.join("\n") + "\n")] };
}

/** The source data as a zip of CSV files, written to a temporary file as it is made. */
export async function sourceDataZip(review: FigureReview): Promise<ExportBody> {
  const zip = new ZipFileWriter();
  try {
    for await (const entry of sourceDataEntries(review)) await zip.add(entry.name, entry.content);
    return ExportBody.ofTempFile(zip.path, await zip.finish());
  } catch (err) {
    await zip.discard();
    throw err;
  }
}
