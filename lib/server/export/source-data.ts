import "server-only";
import { strToU8, zipSync } from "fflate";
import { inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { revisions, versions } from "@/db/schema";
import { axisTitle } from "@/lib/data/format";
import { loadBoundData } from "../figures/bindings";
import type { FigureReview } from "../review/review-context";

/**
 * Text a spreadsheet would run as a formula (=, +, -, @, tab or CR first) gets a leading
 * apostrophe, so opening the source data never evaluates a cell; numbers are written as they are.
 */
export function csvCell(v: unknown): string {
  if (v === null || v === undefined) return "";
  // Cells are JSON values: text, numbers, booleans (an object or list is written as its JSON).
  let s = typeof v === "string" ? v : typeof v === "number" || typeof v === "boolean" ? String(v) : JSON.stringify(v);
  if (typeof v !== "number" && /^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** CSV with a header row; `units` names a column's unit, written into its header as "tau (µs)". */
export function rowsToCsv(rows: Array<Record<string, unknown>>, units: Record<string, string | null> = {}): string {
  if (!rows.length) return "";
  const cols = Object.keys(rows[0]);
  const header = cols.map((c) => csvCell(units[c] ? axisTitle(c, units[c]) : c));
  return [header.join(","), ...rows.map((r) => cols.map((c) => csvCell(r[c])).join(","))].join("\n") + "\n";
}

/** Column units of the versions bound to a revision, by version id then column name. */
async function unitsOf(versionIds: string[]): Promise<Map<string, Record<string, string | null>>> {
  const ids = [...new Set(versionIds)];
  const rows = ids.length ? await getDb().select({ id: versions.id, columns: versions.columns }).from(versions).where(inArray(versions.id, ids)) : [];
  return new Map(rows.map((v) => [v.id, Object.fromEntries(v.columns.map((c) => [c.name, c.unit]))]));
}

/**
 * The per-figure source data journals ask for: one CSV per panel and data name, every point
 * (never downsampled), units in the column headers ("tau (µs)"), and a README naming each
 * file's origin by hash.
 */
export async function sourceDataFiles(review: FigureReview): Promise<Record<string, Uint8Array>> {
  const files: Record<string, Uint8Array> = {};
  const readme = [`Source data for Figure ${review.figure.number}: ${review.figure.title}`, `Figure hash: ${review.figureHash}`, ""];
  const revIds = review.panels.map((p) => p.revision?.id).filter((x): x is string => Boolean(x));
  const revs = revIds.length ? await getDb().select().from(revisions).where(inArray(revisions.id, revIds)) : [];
  for (const p of review.panels) {
    const rev = revs.find((r) => r.id === p.revision?.id);
    if (!rev) {
      readme.push(`Panel ${p.letter}: no revision yet.`);
      continue;
    }
    const data = await loadBoundData(rev.bound);
    const units = await unitsOf(Object.values(rev.bound).map((b) => b.versionId));
    readme.push(`Panel ${p.letter} — revision ${rev.number}, content hash ${rev.contentHash}`);
    for (const [name, rows] of Object.entries(data)) {
      const file = `figure-${review.figure.number}-panel-${p.letter}-${name}.csv`;
      const b = rev.bound[name];
      files[file] = strToU8(rowsToCsv(rows, units.get(b.versionId) ?? {}));
      readme.push(`  ${file}: ${rows.length} rows from ${b.kind} ${b.id}${b.output ? ` (${b.output})` : ""}, source sha256 ${b.sha256}`);
    }
  }
  files["README.txt"] = strToU8(readme.join("\n") + "\n");
  return files;
}

export function zip(files: Record<string, Uint8Array>): Uint8Array {
  return zipSync(Object.fromEntries(Object.entries(files).map(([k, v]) => [k, [v, { level: 6, mtime: new Date("2000-01-01T00:00:00Z") }]])));
}
