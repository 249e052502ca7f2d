import "server-only";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { strFromU8 } from "fflate";
import { storedParameters, parameterRows, type StoredParameter } from "@/lib/figures/fit-value";
import type { ParsedTable, ParseOptions } from "@/lib/data/parse";
import { tableOf, tableOfRows, tableRows, type RowTable, type TableRow } from "@/lib/data/table-rows";
import { readHouseStyle } from "@/lib/figures/house-style";
import { authorize, type SessionUser } from "@/lib/authz";
import { env } from "@/lib/env";
import { badRequest } from "@/lib/errors";
import { fitColumns } from "../analyses/fit-data";
import { curveFor, fitOrExplain } from "../analyses/run-analysis";
import type { FitOptions } from "../analyses/schemas";
import { sha256Hex } from "../crypto";
import type { IngestJob } from "../datasets/ingest-in-child";
import { SERIES } from "../figures/bindings";
import { consumeRate } from "../limits/rate-limit";
import { readFileBytes, removeTemp } from "../storage/blob-store";
import { readMultipartUpload } from "../storage/multipart";
import { acquireUploadSlot } from "../storage/upload-slots";
import { DRAFT_MARK_TEXT, withDraftMark } from "./draft-mark";
import { BUNDLE_PATHS, type BundleParseRecord, type BundlePanelData, type BundleRender } from "./bundle-layout";
import { drawFigure, figureLayout, figurePanelJobs } from "./render-figure";
import { reparseInChild } from "./reparse-in-child";
import { unpackArchive } from "./safe-unzip";

/** Fitted parameters and their standard errors must agree to this relative difference. */
const FIT_RELATIVE_TOLERANCE = 1e-6;
const TOL = FIT_RELATIVE_TOLERANCE.toExponential(); // "1e-6"

const VERIFY_TOLERANCES = {
  sha256: "exact: every file's SHA-256 and size as ro-crate-metadata.json lists them",
  parse: "exact: format, encoding, delimiter, decimal mark, columns, row count and column statistics as recorded at upload",
  rows: "exact: every row each panel was drawn from, re-read from the raw or derived file (or the fit report)",
  fit: `${TOL} relative: each fitted parameter and standard error, re-fitted from the recorded model and options; the fitted curve to ${TOL} of its largest |y|; the fitted points exact`,
  render: "identical SVG after canonicalisation (line endings, whitespace between tags, element ids numbered in order of appearance)",
} as const;

type VerifyCheck = keyof typeof VERIFY_TOLERANCES | "bundle";

interface VerifyRow {
  /** The file, fit or panel checked. */
  item: string;
  check: VerifyCheck;
  match: boolean;
  /** What was compared; the numbers when they differ. */
  detail: string;
}

export interface VerifyReport {
  ok: boolean;
  /** SHA-256 of the zip as received. */
  bundleSha256: string;
  tolerances: typeof VERIFY_TOLERANCES;
  rows: VerifyRow[];
}

type Json = Record<string, unknown>;
type Entity = Json & { "@id": string; "@type": string | string[] };

/**
 * Checks a reproducibility bundle from its own contents: re-hashes every file against
 * ro-crate-metadata.json, re-parses every raw and derived file and compares it with what the
 * application recorded and with the rows each panel was drawn from, re-runs every fit from its
 * recorded model and options, and draws the figure again from the specs and rows to compare with
 * figure.svg. Reads no database: the answer depends on the zip alone.
 */
export async function verifyBundle(zipBytes: Uint8Array): Promise<VerifyReport> {
  const files = unpackArchive(zipBytes);
  const rows: VerifyRow[] = [];
  const report = () => ({ ok: rows.length > 0 && rows.every((r) => r.match), bundleSha256: sha256Hex(zipBytes), tolerances: VERIFY_TOLERANCES, rows });

  const metadata = readJson(files, BUNDLE_PATHS.metadata);
  const graph = metadata.ok && Array.isArray(metadata.value["@graph"]) ? (metadata.value["@graph"] as Entity[]) : null;
  if (!graph) {
    rows.push({ item: BUNDLE_PATHS.metadata, check: "bundle", match: false, detail: metadata.ok ? "has no @graph" : metadata.error });
    return report();
  }
  const entities = new Map(graph.filter((e) => e && typeof e["@id"] === "string").map((e) => [e["@id"], e]));

  // 1. Every file against its recorded SHA-256 and size; every file in the zip listed.
  const listed = graph.filter((e) => e["@type"] === "File" || (Array.isArray(e["@type"]) && e["@type"].includes("File")));
  const listedIds = new Set(listed.map((e) => e["@id"]));
  for (const e of listed) rows.push(hashRow(e, files[e["@id"]]));
  for (const path of Object.keys(files).sort())
    if (path !== BUNDLE_PATHS.metadata && !listedIds.has(path))
      rows.push({ item: path, check: "sha256", match: false, detail: "in the zip but not listed in ro-crate-metadata.json" });

  // 2. Every raw and derived file parsed again and compared with the record of its parse at upload.
  const parsedRecord = readJson(files, BUNDLE_PATHS.parsed);
  const tables = new Map<string, ParsedTable>();
  if (!parsedRecord.ok) rows.push({ item: BUNDLE_PATHS.parsed, check: "bundle", match: false, detail: parsedRecord.error });
  else {
    const dir = await fs.promises.mkdtemp(path.join(os.tmpdir(), "prooflight-verify-"));
    try {
      for (const [file, rec] of Object.entries(parsedRecord.value as Record<string, BundleParseRecord>)) {
        const { row, table } = await parseRow(file, rec, files[file], dir);
        rows.push(row);
        if (table) tables.set(file, table);
      }
    } finally {
      await fs.promises.rm(dir, { recursive: true, force: true });
    }
  }

  // 3. The rows each panel was drawn from, read again from those files (or the fit report).
  const render = readJson(files, BUNDLE_PATHS.render);
  const renderRecord = render.ok ? (render.value as unknown as BundleRender) : null;
  if (!renderRecord) rows.push({ item: BUNDLE_PATHS.render, check: "bundle", match: false, detail: render.ok ? "" : render.error });
  // One panel's recorded rows are held at a time; what is drawn again keeps the columns read again.
  const panelTables = new Map<string, Record<string, RowTable>>();
  for (const panel of renderRecord?.panels ?? []) {
    const data = readJson(files, panel.data);
    if (!data.ok) {
      rows.push({ item: `panel ${panel.letter}`, check: "rows", match: false, detail: data.error });
      continue;
    }
    const bound: Record<string, RowTable> = {};
    for (const [name, b] of Object.entries((data.value as unknown as BundlePanelData).data ?? {})) {
      const checked = boundRows(`panel ${panel.letter} · ${name}`, b, tables, files);
      rows.push(checked.row);
      bound[name] = checked.table;
    }
    panelTables.set(panel.letter, bound);
  }

  // 4. Every fit run again from its recorded model and options on the raw file it read.
  for (const fit of graph.filter((e) => e["@type"] === "CreateAction" && e["@id"].startsWith("#fit-"))) rows.push(fitRow(fit, entities, files, tables));

  // 5. The figure drawn again from the specs and rows, compared with figure.svg panel by panel.
  if (renderRecord) rows.push(...(await renderRows(renderRecord, panelTables, files)));

  return report();
}

/** Bundles a person may check per hour: each one re-runs every fit and draws the figure again. */
const VERIFIES_PER_HOUR = 60;

/**
 * POST /api/bundles/verify: the zip as the multipart `file` part (up to UPLOAD_MAX_BYTES), checked from its
 * own contents. Nothing is stored: the upload's temporary file is removed whatever the outcome.
 */
export async function verifyUploadedBundle(user: SessionUser, req: Request): Promise<VerifyReport> {
  await authorize(user, "bundle.verify");
  const release = acquireUploadSlot(user.id);
  try {
    await consumeRate([
      {
        bucket: `bundle-verify:user:${user.id}`,
        max: VERIFIES_PER_HOUR,
        windowMs: 3600_000,
        message: `You have checked ${VERIFIES_PER_HOUR} bundles in the last hour.`,
      },
    ]);
    const { file } = await readMultipartUpload(req, env().uploadMaxBytes);
    if (!file) throw badRequest("file: the multipart body has no `file` part (the bundle's .zip).");
    try {
      return await verifyBundle(await readFileBytes(file.tmp));
    } finally {
      await removeTemp(file.tmp);
    }
  } finally {
    release();
  }
}

function readJson(files: Record<string, Uint8Array>, path: string): { ok: true; value: Json } | { ok: false; error: string } {
  const bytes = files[path];
  if (!bytes) return { ok: false, error: `${path} is missing from the bundle` };
  try {
    const value = JSON.parse(strFromU8(bytes)) as unknown;
    if (!value || typeof value !== "object") return { ok: false, error: `${path} is not a JSON object` };
    return { ok: true, value: value as Json };
  } catch (err) {
    return { ok: false, error: `${path} is not valid JSON (${(err as Error).message})` };
  }
}

const short = (sha: string) => sha.slice(0, 16);

function hashRow(e: Entity, bytes: Uint8Array | undefined): VerifyRow {
  const item = e["@id"];
  if (!bytes) return { item, check: "sha256", match: false, detail: "listed in ro-crate-metadata.json but missing from the zip" };
  const actual = sha256Hex(bytes);
  const recorded = typeof e.sha256 === "string" ? e.sha256 : "(none)";
  const size = String(bytes.byteLength);
  if (actual !== recorded) return { item, check: "sha256", match: false, detail: `recorded ${short(recorded)}…, file ${short(actual)}… (${size} bytes)` };
  if (e.contentSize !== size) return { item, check: "sha256", match: false, detail: `recorded size ${String(e.contentSize)} bytes, file ${size} bytes` };
  return { item, check: "sha256", match: true, detail: `${short(actual)}…, ${size} bytes` };
}

/** The parse options the application used for a file, from its record (format, delimiter and decimal mark as detected or chosen). */
function parseOptionsOf(rec: BundleParseRecord): IngestJob["options"] {
  return {
    format: rec.format as ParseOptions["format"],
    ...(rec.delimiter ? { delimiter: rec.delimiter as ParseOptions["delimiter"] } : {}),
    decimal: rec.decimal as ParseOptions["decimal"],
  };
}

/** A raw or derived file parsed again (in the ingest child, as at upload) and compared with the record of its parse. */
async function parseRow(path: string, rec: BundleParseRecord, bytes: Uint8Array | undefined, dir: string): Promise<{ row: VerifyRow; table?: ParsedTable }> {
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

function fitReport(
  files: Record<string, Uint8Array>,
  path: string,
): { model: string; modelVersion: string; options: FitOptions; result: Json; inputSha256: string } | string {
  const r = readJson(files, path);
  if (!r.ok) return r.error;
  const v = r.value;
  if (typeof v.model !== "string" || !v.options || typeof v.options !== "object" || !v.result || typeof v.result !== "object")
    return `${path} does not name a model, options and result`;
  return v as never;
}

/** The first difference between the recorded rows and the rows read again, or null when they are identical. */
function firstRowDifference(recorded: TableRow[], actual: RowTable): string | null {
  if (recorded.length !== actual.length) return `recorded ${recorded.length} rows, re-read ${actual.length}`;
  const column = new Map(actual.names.map((n, j) => [n, j]));
  for (let i = 0; i < recorded.length; i++) {
    for (const k of new Set([...Object.keys(recorded[i]), ...actual.names])) {
      const j = column.get(k);
      const again = j === undefined ? null : actual.cell(i, j);
      if (!Object.is(recorded[i][k] ?? null, again)) return `row ${i + 1}, ${k}: recorded ${JSON.stringify(recorded[i][k])}, re-read ${JSON.stringify(again)}`;
    }
  }
  return null;
}

/**
 * One bound name's recorded rows against the rows read again from its file (or fit report). The table
 * to draw from: the one read again when they match (held as columns), else the recorded rows.
 */
function boundRows(
  item: string,
  b: Omit<BundlePanelData["data"][string], "rows"> & { rows?: unknown },
  tables: Map<string, ParsedTable>,
  files: Record<string, Uint8Array>,
): { row: VerifyRow; table: RowTable } {
  const recordedRows = Array.isArray(b.rows) ? (b.rows as TableRow[]) : [];
  const recorded = () => tableOfRows(recordedRows);
  let actual: RowTable;
  let source: string;
  if (b.output === "parameters") {
    const report = fitReport(files, b.fit ?? "");
    if (typeof report === "string") return { row: { item, check: "rows", match: false, detail: report }, table: recorded() };
    actual = tableOfRows(parameterRows(report.model, storedParameters(report.result)));
    source = `the parameters of ${b.fit}`;
  } else {
    const table = tables.get(b.file);
    if (!table) return { row: { item, check: "rows", match: false, detail: `${b.file} was not parsed` }, table: recorded() };
    actual = tableOf(table, b.output ? SERIES[b.output] : null);
    source = b.output ? `the ${b.output} rows of ${b.file}` : b.file;
  }
  const diff = firstRowDifference(recordedRows, actual);
  return diff
    ? { row: { item, check: "rows", match: false, detail: `${diff} (from ${source})` }, table: recorded() }
    : { row: { item, check: "rows", match: true, detail: `${actual.length} rows identical to ${source}` }, table: actual };
}

const refId = (v: unknown): string | undefined =>
  v && typeof v === "object" && typeof (v as Json)["@id"] === "string" ? ((v as Json)["@id"] as string) : undefined;
const refIds = (v: unknown): string[] => (Array.isArray(v) ? v : v ? [v] : []).map(refId).filter((x): x is string => Boolean(x));

/** |a − b| / max(|a|, |b|); 0 when both are 0; null on both sides counts as equal. */
function relativeDifference(a: number | null, b: number | null): number {
  if (a === null || b === null) return a === b ? 0 : Infinity;
  if (a === b) return 0;
  return Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

const nullIfNaN = (v: number) => (Number.isFinite(v) ? v : null);
const sci = (v: number) => (v === Infinity ? "∞" : v.toExponential(1));

function fitRow(action: Entity, entities: Map<string, Entity>, files: Record<string, Uint8Array>, tables: Map<string, ParsedTable>): VerifyRow {
  const results = refIds(action.result);
  const reportPath = results.find((p) => p.startsWith("fits/") && p.endsWith(".json"));
  const derivedPath = results.find((p) => !p.startsWith("fits/"));
  const inputPath = refIds(action.object)[0];
  const item = `fit ${action["@id"].slice("#fit-".length)}${reportPath ? ` (${reportPath})` : ""}`;
  const fail = (detail: string): VerifyRow => ({ item, check: "fit", match: false, detail });
  if (!reportPath || !inputPath) return fail("the fit's CreateAction names no report or no input file");
  const report = fitReport(files, reportPath);
  if (typeof report === "string") return fail(report);
  const table = tables.get(inputPath);
  if (!table) return fail(`its input ${inputPath} was not parsed`);

  let refit: ReturnType<typeof fitOrExplain>;
  let data: ReturnType<typeof fitColumns>;
  try {
    data = fitColumns(table, report.options, 0);
    refit = fitOrExplain({ model: report.model, options: report.options }, data);
  } catch (err) {
    return fail(`could not be run again: ${(err as Error).message}`);
  }
  const diffs: string[] = [];
  const notes: string[] = [];
  if (refit.modelVersion !== report.modelVersion) diffs.push(`model version: recorded ${report.modelVersion}, this software ${refit.modelVersion}`);
  const recorded = new Map(storedParameters(report.result).map((p: StoredParameter) => [p.name, p]));
  let worst = 0;
  for (const p of refit.params) {
    const r = recorded.get(p.name);
    if (!r) {
      diffs.push(`${p.name}: not in the report`);
      continue;
    }
    recorded.delete(p.name);
    for (const [what, a, b] of [
      ["", r.value, nullIfNaN(p.value)],
      [" σ", r.stderr, nullIfNaN(p.stderr)],
    ] as const) {
      const d = relativeDifference(a, b);
      worst = Math.max(worst, d);
      if (d > FIT_RELATIVE_TOLERANCE) diffs.push(`${p.name}${what}: recorded ${a}, re-fitted ${b} (relative difference ${sci(d)} > ${TOL})`);
    }
    notes.push(`${p.name} = ${p.value}`);
  }
  for (const name of recorded.keys()) diffs.push(`${name}: in the report, not fitted`);

  // The derived file written by the fit: the points it was fitted to (exact) and the curve (to the tolerance).
  const derived = derivedPath ? tables.get(derivedPath) : undefined;
  if (derivedPath && derived) {
    const x = report.options.x;
    const y = report.options.y;
    const points = tableRows(derived, SERIES.data);
    const pointDiff = firstRowDifference(
      points.map((r) => ({ x: r[x], y: r[y] })),
      tableOfRows(Array.from(data.x, (v, i) => ({ x: nullIfNaN(v), y: nullIfNaN(data.y[i]) }))),
    );
    if (pointDiff) diffs.push(`fitted points in ${derivedPath} differ from ${inputPath}: ${pointDiff}`);
    const curve = tableRows(derived, SERIES.curve);
    const again = curveFor(report.model, refit, data.x);
    const scale = Math.max(...again.y.map((v) => Math.abs(v)).filter(Number.isFinite), 0) || 1;
    if (curve.length !== again.x.length) diffs.push(`fitted curve: recorded ${curve.length} points, re-fitted ${again.x.length}`);
    else
      for (let i = 0; i < curve.length; i++) {
        const dy = Math.abs((curve[i][y] as number) - again.y[i]) / scale;
        const dx = relativeDifference(curve[i][x] as number | null, nullIfNaN(again.x[i]));
        if (!(dy <= FIT_RELATIVE_TOLERANCE) || dx > FIT_RELATIVE_TOLERANCE) {
          diffs.push(`fitted curve point ${i + 1}: recorded (${curve[i][x]}, ${curve[i][y]}), re-fitted (${again.x[i]}, ${again.y[i]})`);
          break;
        }
      }
  } else if (derivedPath) diffs.push(`its derived file ${derivedPath} was not parsed`);

  const model = entities.get(refIds(action.instrument)[0] ?? "");
  const modelName = typeof model?.identifier === "string" ? model.identifier : report.model;
  if (diffs.length) return fail(diffs.join("; "));
  return {
    item,
    check: "fit",
    match: true,
    detail: `${modelName} ${report.modelVersion} on ${data.x.length} points of ${inputPath}: ${notes.join(", ")}; largest relative difference ${worst === 0 ? "0" : sci(worst)}`,
  };
}

/** SVG compared modulo line endings, whitespace between tags, and the names of element ids (numbered in order of appearance). */
function canonicalSvg(svg: string): string {
  const text = svg.replace(/\r\n?/g, "\n").replace(/>\s+</g, "><").trim();
  const names = new Map<string, string>();
  for (const m of text.matchAll(/\sid="([^"]+)"/g)) if (!names.has(m[1])) names.set(m[1], `id${names.size + 1}`);
  if (!names.size) return text;
  return text
    .replace(/(\sid=")([^"]+)"/g, (_, a: string, id: string) => `${a}${names.get(id)}"`)
    .replace(/url\(\s*#([^)\s]+)\s*\)/g, (m, id: string) => (names.has(id) ? `url(#${names.get(id)})` : m))
    .replace(/((?:xlink:)?href=")#([^"]+)"/g, (m, a: string, id: string) => (names.has(id) ? `${a}#${names.get(id)}"` : m));
}

/** The composed figure cut at each panel group: the part before the first panel, then one part per panel letter. */
function panelParts(svg: string): { head: string; panels: Map<string, string> } {
  const pieces = svg.split(/(?=<g class="panel panel-)/);
  const panels = new Map<string, string>();
  for (const piece of pieces.slice(1)) {
    const letter = /^<g class="panel panel-([^"]*)"/.exec(piece)![1];
    panels.set(letter, piece);
  }
  return { head: pieces[0] ?? "", panels };
}

async function renderRows(record: BundleRender, panelTables: Map<string, Record<string, RowTable>>, files: Record<string, Uint8Array>): Promise<VerifyRow[]> {
  const out: VerifyRow[] = [];
  const stored = files[BUNDLE_PATHS.figureSvg];
  if (!stored) return [{ item: BUNDLE_PATHS.figureSvg, check: "render", match: false, detail: "missing from the bundle" }];
  const style = readHouseStyle(record.houseStyle);
  const panels = [];
  for (const p of record.panels) {
    const spec = readJson(files, p.spec);
    const data = panelTables.get(p.letter);
    if (!spec.ok || !data) {
      out.push({ item: `panel ${p.letter}`, check: "render", match: false, detail: spec.ok ? `${p.data} is missing or unreadable` : spec.error });
      continue;
    }
    panels.push({ letter: p.letter, spec: spec.value, data, span: p.span });
  }
  if (out.length) return out;
  const jobs = figurePanelJobs(panels, { columns: record.columns, shareYTitles: record.shareYTitles === true }, style);
  let drawn: string;
  let reduced: boolean;
  try {
    const again = await drawFigure(jobs, figureLayout(record.columns, style), record.widthMm);
    drawn = again.figure.svg;
    reduced = again.reduced;
  } catch (err) {
    return [{ item: BUNDLE_PATHS.figureSvg, check: "render", match: false, detail: `could not be drawn again: ${(err as Error).message}` }];
  }
  const bundled = strFromU8(stored);
  // An export of a figure not signed off carries the draft mark; drawn again the same way when figure.svg has it.
  const marked = bundled.includes(DRAFT_MARK_TEXT);
  const candidate = canonicalSvg(marked ? withDraftMark(drawn, record.figureHash) : drawn);
  const actual = canonicalSvg(bundled);
  const a = panelParts(candidate);
  const b = panelParts(actual);
  for (const [i, p] of record.panels.entries()) {
    const letter = jobs[i].letter;
    const mine = a.panels.get(letter);
    const theirs = b.panels.get(letter);
    const item = `panel ${p.letter}`;
    if (theirs === undefined) out.push({ item, check: "render", match: false, detail: `figure.svg has no panel ${letter}` });
    else if (mine === theirs)
      out.push({ item, check: "render", match: true, detail: `drawn again from ${p.spec} and ${p.data}: identical SVG (${mine.length} characters)` });
    else
      out.push({
        item,
        check: "render",
        match: false,
        detail: `drawn again from ${p.spec} and ${p.data}: SVG differs at character ${firstDifference(mine ?? "", theirs)}`,
      });
  }
  const same = candidate === actual;
  out.push({
    item: BUNDLE_PATHS.figureSvg,
    check: "render",
    match: same,
    detail: `${same ? "identical SVG" : `SVG differs at character ${firstDifference(candidate, actual)}`} (${record.panels.length} panels, ${record.widthMm} mm wide${marked ? `, with the draft mark for figure hash ${short(record.figureHash)}…` : ""}${reduced ? ", long series reduced as the export does" : ""})`,
  });
  return out;
}

function firstDifference(a: string, b: string): number {
  const n = Math.min(a.length, b.length);
  for (let i = 0; i < n; i++) if (a[i] !== b[i]) return i + 1;
  return n + 1;
}

/** The report as a plain-text table: item, check, match or mismatch, and the detail; the tolerances first. */
export function formatVerifyReport(report: VerifyReport): string {
  const head = ["Item", "Check", "Result", "Detail"];
  const body = report.rows.map((r) => [r.item, r.check, r.match ? "match" : "MISMATCH", r.detail]);
  const widths = [0, 1, 2].map((i) => Math.max(head[i].length, ...body.map((r) => r[i].length)));
  const line = (cells: string[]) =>
    cells
      .map((c, i) => (i < 3 ? c.padEnd(widths[i]) : c))
      .join("  ")
      .trimEnd();
  const failed = report.rows.filter((r) => !r.match);
  return [
    `Bundle sha256 ${report.bundleSha256}`,
    "Tolerances:",
    ...Object.entries(report.tolerances).map(([k, v]) => `  ${k}: ${v}`),
    "",
    line(head),
    line(widths.map((w) => "-".repeat(w)).concat("------")),
    ...body.map(line),
    "",
    report.ok
      ? `All ${report.rows.length} checks match.`
      : `${failed.length} of ${report.rows.length} checks do not match: ${[...new Set(failed.map((r) => r.item))].join(", ")}.`,
  ].join("\n");
}
