import { createHash } from "node:crypto";
import ExcelJS from "exceljs";
import { strFromU8, unzipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { loadReviewContext } from "@/lib/server/review/review-context";
import { sourceDataWorkbook } from "@/lib/server/export/source-data-xlsx";
import { stopRenderWorkers } from "@/lib/server/render/render-in-worker";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as analyses from "@/app/api/analyses/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

const VL = "https://vega.github.io/schema/vega-lite/v6.json";

// A Hahn-echo decay written out as text; the sample column holds text a spreadsheet would take for
// a formula (=, +, - or @ first; the upload trims a leading tab or CR, so none reaches a sheet).
// Every expected cell below is read back from this text.
const TAUS = [1, 2, 4, 7, 10, 15, 20, 30, 40, 55, 70, 90, 120, 160, 200, 260, 330, 420, 550, 700];
const SAMPLES = ["=1+1", "+x", "-y", "@z", "=A1*2", "NV-01"];
const echoCsv = (wiggle: number) =>
  "tau (µs),signal (norm),sigma (norm),sample\n" +
  TAUS.map((t, i) => {
    const signal = 0.1 + 0.8 * Math.exp(-((t / 60) ** 1.5)) + (i % 2 ? wiggle : -wiggle);
    return `${t},${signal.toFixed(5)},0.01000,"${SAMPLES[i % SAMPLES.length]}"`;
  }).join("\n") +
  "\n";
const CSV_V1 = echoCsv(0.004);
const CSV_V2 = echoCsv(0.006);
/** A dataset name is text from a person too, and lands in the header block. */
const DATASET = "=SUM(1,2) echo S1";

/** The rows of a CSV text as cells: numbers where the text is a number, the text (unquoted) otherwise. */
function csvRows(text: string): { header: string[]; rows: Array<Array<number | string>> } {
  const [header, ...lines] = text.trim().split("\n");
  const cell = (s: string) => (s.startsWith('"') ? s.slice(1, -1) : Number(s));
  return { header: header!.split(","), rows: lines.map((l) => l.split(",").map(cell)) };
}

const sha256 = (text: string) => createHash("sha256").update(new TextEncoder().encode(text)).digest("hex");

let tokens: Record<Who, string>;
let figureId: string;
let fitParameters: Array<{ name: string; value: number; stderr: number; unit: string | null; fixed?: boolean }>;
let bytes: Uint8Array;
let workbook: ExcelJS.Workbook;

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const post = async (content: string, fields: Record<string, string>) =>
    (
      await call(upload.POST, {
        method: "POST",
        token: tokens.author,
        params: { id: DEMO_MANUSCRIPT_ID },
        rawBody: uploadForm("echo_S1.csv", content, fields),
      })
    ).json;
  const v1 = await post(CSV_V1, { name: DATASET });
  const v2 = await post(CSV_V2, { datasetId: v1.datasetId });
  expect([v1.number, v2.number]).toEqual([1, 2]);
  const fit = (
    await call(analyses.POST, {
      method: "POST",
      token: tokens.author,
      body: { versionId: v1.id, model: "hahn_echo", options: { x: "tau", y: "signal", sigma: "sigma" } },
    })
  ).json;
  fitParameters = fit.parameters;
  figureId = (
    await call(figuresRoute.POST, {
      method: "POST",
      token: tokens.author,
      body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Coherence", widthMm: 183, columns: 2 },
    })
  ).json.id;
  const add = async () => (await call(panelsRoute.POST, { method: "POST", token: tokens.author, params: { id: figureId }, body: {} })).json.id as string;
  const [a, b] = [await add(), await add()];
  await add(); // panel c: no revision yet
  const enc = { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative" } };
  const save = async (panel: string, bindings: object, layer: object[]) =>
    expect(
      (
        await call(revisions.POST, {
          method: "POST",
          token: tokens.author,
          params: { id: panel },
          body: { baseRevisionId: null, bindings, spec: { $schema: VL, width: 200, height: 140, layer } },
        })
      ).status,
    ).toBe(201);
  await save(a, { echo: { versionId: v1.id }, fit: { analysisId: fit.id, output: "curve" } }, [
    { data: { name: "echo" }, mark: "point", encoding: enc },
    { data: { name: "fit" }, mark: "line", encoding: enc },
  ]);
  await save(b, { later: { versionId: v2.id }, res: { analysisId: fit.id, output: "residuals" }, params: { analysisId: fit.id, output: "parameters" } }, [
    { data: { name: "later" }, mark: "point", encoding: enc },
    { data: { name: "res" }, mark: "point", encoding: enc },
    { data: { name: "params" }, transform: [{ filter: { field: "name", equal: "T2" } }], mark: "text", encoding: { text: { field: "text", type: "nominal" } } },
  ]);
  const [review] = await loadReviewContext({ figureId });
  bytes = await (await sourceDataWorkbook(review!)).bytes();
  workbook = new ExcelJS.Workbook();
  await workbook.xlsx.load(bytes.slice().buffer); // a copy: exactly the file's bytes
}, 120_000);
afterAll(async () => {
  await stopRenderWorkers();
});

/** A sheet's rows as lists of cells, row 1 first. */
function rowsOf(name: string): ExcelJS.Cell[][] {
  const ws = workbook.getWorksheet(name)!;
  expect(ws, name).toBeTruthy();
  const out: ExcelJS.Cell[][] = [];
  for (let r = 1; r <= ws.rowCount; r++) {
    const row = ws.getRow(r);
    out.push(Array.from({ length: row.cellCount }, (_, c) => row.getCell(c + 1)));
  }
  return out;
}
const valuesOf = (cells: ExcelJS.Cell[] | undefined) => (cells ?? []).map((c) => c.value);

/** The table under "Data: <name>": its header row and exactly the rows it announces. */
function table(sheet: string, name: string): { header: unknown[]; rows: ExcelJS.Cell[][]; after: ExcelJS.Cell[] | undefined } {
  const rows = rowsOf(sheet);
  const at = rows.findIndex((r) => r[0]?.value === `Data: ${name}`);
  expect(at, `Data: ${name} in ${sheet}`).toBeGreaterThan(0);
  const count = Number(/^(\d+) rows$/.exec(String(rows[at]![1]!.value))![1]);
  return { header: valuesOf(rows[at + 1]), rows: rows.slice(at + 2, at + 2 + count), after: rows[at + 2 + count] };
}

/** Cell by cell: numbers as number cells with the same value, text as string cells with the same text. */
function expectCells(cells: ExcelJS.Cell[][], expected: Array<Array<number | string>>) {
  expect(cells).toHaveLength(expected.length);
  expected.forEach((row, r) =>
    row.forEach((want, c) => {
      const cell = cells[r]![c]!;
      expect(cell.type, `row ${r + 1} column ${c + 1}`).toBe(typeof want === "number" ? ExcelJS.ValueType.Number : ExcelJS.ValueType.String);
      expect(cell.value, `row ${r + 1} column ${c + 1}`).toBe(want);
    }),
  );
}

describe("source data as one xlsx workbook per figure", () => {
  it("has a sheet per panel, named by its letter", () => {
    expect(workbook.worksheets.map((w) => w.name)).toEqual(["Panel a", "Panel b", "Panel c"]);
    expect(valuesOf(rowsOf("Panel c")[2])).toEqual(["No revision yet: this panel plots nothing."]);
  });

  it("holds exactly the uploaded rows, cell by cell, with the units in the column headers", () => {
    const v1 = csvRows(CSV_V1);
    const echo = table("Panel a", "echo");
    expect(echo.header).toEqual(["tau (µs)", "signal (norm)", "sigma (norm)", "sample"]);
    expectCells(echo.rows, v1.rows);
    expect(valuesOf(echo.after)).toEqual([]); // nothing after the last row but a blank line
    const later = table("Panel b", "later");
    expect(later.header).toEqual(v1.header); // the uploaded header, units and all
    expectCells(later.rows, csvRows(CSV_V2).rows);
  });

  it("gives the fit's rows at full resolution: every residual at the uploaded τ, the curve with its units", () => {
    const res = table("Panel b", "res");
    expect(res.header).toEqual(["series", "tau (µs)", "signal (norm)"]);
    expect(res.rows.map((r) => r[0]!.value)).toEqual(TAUS.map(() => "residual"));
    expectCells(
      res.rows.map((r) => [r[1]!]),
      csvRows(CSV_V1).rows.map((r) => [r[0]!]),
    );
    const curve = table("Panel a", "fit");
    expect(curve.header).toEqual(["series", "tau (µs)", "signal (norm)"]);
    expect(curve.rows.length).toBeGreaterThan(TAUS.length);
    for (const r of curve.rows) expect([r[0]!.value, r[1]!.type, r[2]!.type]).toEqual(["curve", ExcelJS.ValueType.Number, ExcelJS.ValueType.Number]);
  });

  it("names each bound dataset version by number and SHA-256 (hashed here from the uploaded bytes)", () => {
    const a = rowsOf("Panel a").map(valuesOf);
    expect(a).toContainEqual(["echo", "dataset version", DATASET, 1, TAUS.length, "echo_S1.csv", sha256(CSV_V1)]);
    expect(a).toContainEqual(["Fitted to", "dataset version", DATASET, 1, TAUS.length, "echo_S1.csv", sha256(CSV_V1)]);
    const b = rowsOf("Panel b").map(valuesOf);
    expect(b).toContainEqual(["later", "dataset version", DATASET, 2, TAUS.length, "echo_S1.csv", sha256(CSV_V2)]);
    expect(b).toContainEqual(["Fitted to", "dataset version", DATASET, 1, TAUS.length, "echo_S1.csv", sha256(CSV_V1)]);
  });

  it("names each bound fit with its model and every parameter ± standard error, with units", () => {
    for (const sheet of ["Panel a", "Panel b"]) {
      const rows = rowsOf(sheet).map(valuesOf);
      const fit = rows.findIndex((r) => r[0] === "Fit");
      expect(rows[fit]![2]).toMatch(/^model hahn_echo, version /);
      expect(rows[fit + 2]).toEqual(["Parameter", "Value", "Standard error", "Unit", "As stated"]);
      const params = rows.slice(fit + 3, fit + 3 + fitParameters.length);
      expect(params.map((r) => [r[1], r[2], r[3] ?? null])).toEqual(fitParameters.map((p) => [p.value, p.fixed ? "fixed" : p.stderr, p.unit || null]));
      expect(params.map((r) => r[4])).toContainEqual(expect.stringMatching(/^T₂ = [\d.]+ ± [\d.]+ µs$/));
    }
    const bound = table("Panel b", "params");
    expect(bound.header).toEqual(["name", "symbol", "value", "error", "unit", "model", "text"]);
    expect(bound.rows.map((r) => [r[0]!.value, r[2]!.value])).toEqual(fitParameters.map((p) => [p.name, p.value]));
  });

  it("writes formula-like text as string cells in the Text format, never as formulas", () => {
    const echo = table("Panel a", "echo");
    const samples = echo.rows.map((r) => r[3]!);
    for (const cell of samples) {
      expect(cell.type).toBe(ExcelJS.ValueType.String);
      expect(cell.formula).toBeUndefined();
    }
    for (const cell of samples.filter((c) => c.value !== "NV-01")) expect(cell.numFmt, String(cell.value)).toBe("@");
    expect(samples.find((c) => c.value === "NV-01")!.numFmt).toBeUndefined();
    // The same in the header block: the dataset's name.
    const named = rowsOf("Panel a").find((r) => r[0]?.value === "echo")![2]!;
    expect([named.type, named.value, named.formula, named.numFmt]).toEqual([ExcelJS.ValueType.String, DATASET, undefined, "@"]);
    // In the file itself: no sheet has a formula element (ECMA-376 §18.3.1.40 <f>).
    const files = unzipSync(bytes);
    const sheets = Object.keys(files).filter((f) => /^xl\/worksheets\/sheet\d+\.xml$/.test(f));
    expect(sheets).toHaveLength(3);
    for (const f of sheets) expect(strFromU8(files[f]!)).not.toMatch(/<f[\s>]/);
  });
});
