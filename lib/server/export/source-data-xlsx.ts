import "server-only";
import { once } from "node:events";
import fs from "node:fs";
import { setImmediate as nextTurn } from "node:timers/promises";
import ExcelJS from "exceljs";
import { eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, datasets, versions, type BoundInput } from "@/db/schema";
import { findModel } from "@/lib/analysis/models/registry";
import { axisTitle } from "@/lib/data/format";
import { parameterRows, storedParameters } from "@/lib/figures/fit-value";
import type { FigureReview } from "../review/review-context";
import { removeTemp, tempPath } from "../storage/blob-store";
import { ExportBody } from "./export-body";
import { formulaLike, panelSourceData } from "./source-data";

type Cell = string | number | null | undefined;

// Shared style objects: exceljs recognises a style object it has seen and reuses its style id, where a
// fresh object per cell would be looked up again (half the writing time on a large sheet).
const PLAIN: Partial<ExcelJS.Style> = {};
/** The Text number format ("@"): a formula-like string stays text even when someone edits the cell. */
const TEXT: Partial<ExcelJS.Style> = { numFmt: "@" };
const BOLD: Partial<ExcelJS.Style> = { font: { bold: true } };
const BOLD_TEXT: Partial<ExcelJS.Style> = { font: { bold: true }, numFmt: "@" };

/** How often (in rows) the writer checks that the archive keeps up. */
const FLOW_CHECK_ROWS = 1024;

/** Rows of one sheet, written and committed in order; every string a string cell, every number a number cell. */
class SheetRows {
  private n = 0;
  constructor(readonly sheet: ExcelJS.Worksheet) {}

  add(values: Cell[], bold = false): void {
    const row = this.sheet.getRow(++this.n);
    values.forEach((v, i) => {
      if (v === null || v === undefined || (typeof v === "number" && !Number.isFinite(v))) return;
      const cell = row.getCell(i + 1);
      // A string is always written as a string value (never a formula); one a spreadsheet would take
      // for a formula if typed in also gets the Text format.
      cell.value = v;
      cell.style = typeof v === "string" && formulaLike(v) ? (bold ? BOLD_TEXT : TEXT) : bold ? BOLD : PLAIN;
    });
    row.commit();
  }

  blank(): void {
    this.add([]);
  }

  /**
   * Waits while the archive is behind. exceljs pipes a sheet's XML into the zip without heeding
   * backpressure, so rows produced faster than deflate runs would pile up in memory: wait for the
   * entry's stream to drain, or give the archive a turn when it has not reached this sheet yet.
   * `stream.pipes` is internal to exceljs 4.4.0 (the version is pinned).
   */
  async keepPace(): Promise<void> {
    const pipe = (this.sheet as unknown as { stream?: { pipes?: NodeJS.WritableStream[] } }).stream?.pipes?.[0];
    const state = (pipe as { _writableState?: { needDrain?: boolean } } | undefined)?._writableState;
    if (!pipe) await nextTurn();
    else if (state?.needDrain) await once(pipe, "drain");
  }
}

interface VersionOrigin {
  dataset: string;
  number: number;
  fileName: string;
  rowCount: number;
  sha256: string;
}

/** Dataset name, version number, file, rows and SHA-256 of each version, by id. */
async function versionOrigins(ids: string[]): Promise<Map<string, VersionOrigin>> {
  const unique = [...new Set(ids)];
  if (!unique.length) return new Map();
  const rows = await getDb()
    .select({
      id: versions.id,
      dataset: datasets.name,
      number: versions.number,
      fileName: versions.fileName,
      rowCount: versions.rowCount,
      sha256: versions.sha256,
    })
    .from(versions)
    .innerJoin(datasets, eq(datasets.id, versions.datasetId))
    .where(inArray(versions.id, unique));
  return new Map(rows.map(({ id, ...o }) => [id, o]));
}

const OUTPUT_LABEL: Record<string, string> = { curve: "fit curve", residuals: "fit residuals", data: "fit data points", parameters: "fitted parameters" };

/** The header block of a panel's sheet: each bound dataset version by hash, each bound fit with its parameters. */
async function writeHeaderBlock(w: SheetRows, bound: Record<string, BoundInput>, rowsOf: Map<string, number>): Promise<void> {
  const runIds = [...new Set(Object.values(bound).flatMap((b) => (b.kind === "analysis" ? [b.id] : [])))];
  const runs = runIds.length ? await getDb().select().from(analyses).where(inArray(analyses.id, runIds)) : [];
  const origins = await versionOrigins([...Object.values(bound).map((b) => b.versionId), ...runs.map((r) => r.versionId)]);
  const versionRow = (label: Cell, source: string, versionId: string, rows?: number): Cell[] => {
    const o = origins.get(versionId);
    return [label, source, o?.dataset, o?.number, rows ?? o?.rowCount, o?.fileName, o?.sha256];
  };

  w.add(["Bound data"], true);
  w.add(["Data name", "Source", "Dataset", "Version", "Rows", "File", "SHA-256"], true);
  for (const [name, b] of Object.entries(bound)) {
    const source = b.kind === "version" ? "dataset version" : (OUTPUT_LABEL[b.output ?? ""] ?? `fit ${b.output ?? "output"}`);
    w.add(versionRow(name, source, b.versionId, rowsOf.get(name)));
  }
  for (const run of runs) {
    const model = findModel(run.model);
    const names = Object.entries(bound)
      .filter(([, b]) => b.kind === "analysis" && b.id === run.id)
      .map(([n]) => n);
    w.blank();
    w.add(["Fit", model?.title ?? run.model, `model ${run.model}, version ${run.modelVersion}`, `bound as ${names.join(", ")}`], true);
    w.add(versionRow("Fitted to", "dataset version", run.versionId));
    w.add(["Parameter", "Value", "Standard error", "Unit", "As stated"], true);
    const stored = storedParameters(run.result);
    parameterRows(run.model, stored).forEach((p, i) => w.add([p.symbol, p.value, stored[i].fixed ? "fixed" : p.error, p.unit || null, p.text]));
  }
}

/** One sheet per panel ("Panel a"): a header block naming what the panel binds, then each bound table at full resolution. */
async function writeWorkbook(review: FigureReview, workbook: ExcelJS.stream.xlsx.WorkbookWriter): Promise<void> {
  const figure = `Figure ${review.figure.number}: ${review.figure.title}`;
  for await (const p of panelSourceData(review)) {
    const w = new SheetRows(workbook.addWorksheet(`Panel ${p.letter}`));
    w.sheet.columns = [{ width: 22 }, ...Array.from({ length: 7 }, () => ({ width: 16 }))];
    w.add([`Source data for ${figure}, panel ${p.letter}`], true);
    w.add(["Figure hash", review.figureHash]);
    if (!p.revision) {
      w.add(["No revision yet: this panel plots nothing."]);
      w.sheet.commit();
      continue;
    }
    w.add(["Panel revision", p.revision.number]);
    w.add(["Revision content hash", p.revision.contentHash]);
    w.add(["Every row the panel binds, at full resolution (never the display reduction); units in brackets in the column headers."]);
    w.blank();
    await writeHeaderBlock(w, p.revision.bound, new Map(p.tables.map((t) => [t.name, t.table.length])));
    for (const { name, table, units } of p.tables) {
      const columns = table.length ? table.names : [];
      w.blank();
      w.add([`Data: ${name}`, `${table.length} rows`], true);
      w.add(
        columns.map((c) => axisTitle(c, units[c])),
        true,
      );
      for (let r = 0; r < table.length; r++) {
        w.add(columns.map((_, j) => table.cell(r, j)));
        if (r % FLOW_CHECK_ROWS === FLOW_CHECK_ROWS - 1) await w.keepPace();
      }
    }
    w.sheet.commit();
  }
  if (!review.panels.length) {
    const w = new SheetRows(workbook.addWorksheet("Figure"));
    w.add([`Source data for ${figure}`], true);
    w.add(["Figure hash", review.figureHash]);
    w.add(["This figure has no panels yet."]);
    w.sheet.commit();
  }
}

/**
 * The figure's source data as journals ask for it: one .xlsx workbook, a sheet per panel with
 * exactly the rows it plots, units in the column headers and, above them, the dataset versions
 * (number, SHA-256) and fits (model, parameters ± standard errors, units) they come from. Written
 * with exceljs's streaming writer, one row at a time, into a temporary file, so the workbook is never held as cells or bytes.
 * Text is never a formula: every string is a string cell, and formula-like text (=, +, -, @, tab or
 * CR first) also gets the Text format; numbers are number cells.
 */
export async function sourceDataWorkbook(review: FigureReview): Promise<ExportBody> {
  const file = tempPath();
  try {
    const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ filename: file, useStyles: true, useSharedStrings: true });
    workbook.creator = "Prooflight";
    workbook.title = `Source data for Figure ${review.figure.number}: ${review.figure.title}`;
    await writeWorkbook(review, workbook);
    await workbook.commit();
    return ExportBody.ofTempFile(file, (await fs.promises.stat(file)).size);
  } catch (err) {
    await removeTemp(file);
    throw err;
  }
}
