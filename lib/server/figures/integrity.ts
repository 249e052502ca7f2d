import "server-only";
import { inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { versions, type BoundInput } from "@/db/schema";
import { decodeColumnar } from "@/lib/data/columnar";
import { PARAMETER_COLUMNS } from "@/lib/figures/fit-value";
import { blanksPlot, checkSpecFields, specFieldUses, type ColumnInfo, type FieldProblem } from "@/lib/figures/spec-fields";
import { columnsFor } from "../datasets/columns-cache";
import { SERIES } from "./bindings";

/**
 * Spec ↔ data integrity of a revision (issue 17). At save, `fieldProblems` refuses a spec that
 * names a column its bound data lacks (lib/figures/spec-fields). At render, `revisionWarnings`
 * tells author and reviewer when a panel would show nothing or less than its data: a missing field
 * (revisions saved before the check), bound data with no rows, rows dropped because a
 * quantitative position channel has no number there (Vega-Lite filters them silently).
 */
export interface DataWarning {
  kind: "missing_field" | "no_rows" | "invalid_rows";
  dataName: string;
  field?: string;
  /** Sentence for people, e.g. "Nothing to draw: the field `t_us` is not a column of the data `echo` (columns: t, signal). Did you mean `t` …?" */
  message: string;
  /** missing_field: the columns there are and the suggested one. */
  columns?: string[];
  suggestion?: string | null;
  /** invalid_rows: rows left out, of all rows bound. */
  rows?: number;
  of?: number;
}

/** The columns bound under each data name (an analysis output has the derived version's: series, x, y). */
async function boundColumns(bound: Record<string, BoundInput>): Promise<Record<string, ColumnInfo[]>> {
  const ids = [...new Set(Object.values(bound).map((b) => b.versionId))];
  const rows = ids.length ? await getDb().select({ id: versions.id, columns: versions.columns }).from(versions).where(inArray(versions.id, ids)) : [];
  const byId = new Map(rows.map((r) => [r.id, r.columns]));
  const out: Record<string, ColumnInfo[]> = {};
  for (const [name, b] of Object.entries(bound)) {
    const cols = byId.get(b.versionId);
    if (b.output === "parameters") out[name] = PARAMETER_COLUMNS.map((c) => ({ name: c, unit: null, header: null }));
    else if (cols) out[name] = cols.map((c) => ({ name: c.name, unit: c.unit, header: c.header ?? null }));
  }
  return out;
}

/** Fields of the spec that the bound data does not have; empty when every field is a column. */
export async function fieldProblems(spec: unknown, bound: Record<string, BoundInput>): Promise<FieldProblem[]> {
  return checkSpecFields(spec, await boundColumns(bound));
}

const tick = (s: string) => `\`${s}\``;
const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
const count = (n: number) => n.toLocaleString("en");

function describeData(name: string, b: BoundInput): string {
  return b.output ? `${tick(name)} (the ${b.output} output of the bound analysis)` : tick(name);
}

/** Rows left out per data name: rows with no number in a raw quantitative (or temporal) position field. */
async function rowWarnings(spec: unknown, bound: Record<string, BoundInput>, missing: Set<string>): Promise<DataWarning[]> {
  const uses = specFieldUses(spec);
  const out: DataWarning[] = [];
  // A run's parameters are a few rows written by the service; only files' rows are checked here.
  const names = [...new Set(uses.map((u) => u.dataName))].filter((n) => n in bound && bound[n].output !== "parameters");
  if (!names.length) return out;
  const ids = [...new Set(names.map((n) => bound[n].versionId))];
  const vs = await getDb().select({ id: versions.id, sha: versions.sha256, fileName: versions.fileName }).from(versions).where(inArray(versions.id, ids));
  for (const name of names) {
    const b = bound[name];
    const v = vs.find((x) => x.id === b.versionId);
    if (!v) continue;
    const t = decodeColumnar(await columnsFor(v.sha, v.fileName));
    const colNames = t.columns.map((c) => c.name);
    const wanted = b.output ? SERIES[b.output] : null;
    const seriesCol = wanted ? colNames.indexOf("series") : -1;
    const rowsOf: number[] = [];
    for (let r = 0; r < t.rowCount; r++) if (seriesCol < 0 || t.data[seriesCol][r] === wanted) rowsOf.push(r);
    if (!rowsOf.length) {
      out.push({ kind: "no_rows", dataName: name, message: `Nothing to draw: ${describeData(name, b)} has no rows.`, rows: 0, of: 0 });
      continue;
    }
    const fields = uses
      .filter((u) => u.dataName === name && u.continuous && !missing.has(`${name}\u0000${u.field}`))
      .filter((u, i, all) => all.findIndex((w) => w.field === u.field) === i);
    const bad = new Set<number>();
    const badFields: string[] = [];
    for (const u of fields) {
      const j = colNames.indexOf(u.field);
      if (j < 0 || /(?<!\\)[.[]/.test(u.written)) continue; // nested paths (a.b, a[0]) are not checked
      const col = t.data[j];
      const numeric = t.columns[j].type === "number";
      if (!numeric && u.type !== "quantitative") continue; // dates and labels in text columns are Vega's to parse
      let any = false;
      for (const r of rowsOf) {
        const val = col[r];
        const ok = typeof val === "number" ? Number.isFinite(val) : val.trim() !== "" && Number.isFinite(Number(val));
        if (!ok) {
          bad.add(r);
          any = true;
        }
      }
      if (any) badFields.push(u.field);
    }
    if (bad.size) {
      const all = bad.size === rowsOf.length;
      const where = badFields.map(tick).join(", ");
      out.push({
        kind: "invalid_rows",
        dataName: name,
        field: badFields[0],
        rows: bad.size,
        of: rowsOf.length,
        message: all
          ? `Nothing to draw: none of the ${count(rowsOf.length)} rows of ${describeData(name, b)} has a number in ${where}.`
          : `${count(bad.size)} of ${count(rowsOf.length)} rows of ${describeData(name, b)} are not drawn: they have no number in ${where} (empty, NaN or text).`,
      });
    }
  }
  return out;
}

const cache = new Map<string, DataWarning[]>();
const CACHE_ENTRIES = 1000;

/**
 * What a reader of this revision should know about its data, computed on the server from the
 * stored spec and the bound versions. Revisions and versions are immutable, so the answer is kept
 * per content hash (which covers the spec and every bound input's hash).
 */
export async function revisionWarnings(rev: { spec: unknown; bound: Record<string, BoundInput>; contentHash: string }): Promise<DataWarning[]> {
  const hit = cache.get(rev.contentHash);
  if (hit) return hit;
  const spec = typeof rev.spec === "string" ? (JSON.parse(rev.spec) as unknown) : rev.spec;
  const problems = await fieldProblems(spec, rev.bound);
  const warnings: DataWarning[] = problems.map((p) => ({
    kind: "missing_field",
    dataName: p.dataName,
    field: p.field,
    columns: p.columns,
    suggestion: p.suggestion?.column ?? null,
    message: blanksPlot(p.channel) ? `Nothing to draw: ${p.message}` : capital(p.message),
  }));
  warnings.push(...(await rowWarnings(spec, rev.bound, new Set(problems.map((p) => `${p.dataName}\u0000${p.field}`)))));
  if (cache.size >= CACHE_ENTRIES) cache.delete(cache.keys().next().value as string);
  cache.set(rev.contentHash, warnings);
  return warnings;
}

/**
 * Warnings for several revisions (the figure status page, a figure), by revision id. A revision whose data
 * cannot be read is left out here rather than failing the whole overview; its panel page, which
 * reads the same data, reports the error.
 */
export async function warningsByRevision(
  revs: Array<{ id: string; spec: unknown; bound: Record<string, BoundInput>; contentHash: string }>,
): Promise<Map<string, DataWarning[]>> {
  const out = new Map<string, DataWarning[]>();
  for (const r of revs) {
    try {
      out.set(r.id, await revisionWarnings(r));
    } catch (err) {
      console.error(`data warnings of revision ${r.id} could not be computed:`, err);
    }
  }
  return out;
}
