// Verifying a reproducibility bundle from its own contents (POST /api/bundles/verify, npm run verify). Expected values
// come from outside the code under test: hashes recomputed here with node:crypto, the files listed by unzipping the
// bundle here, the fitted values as the analysis API answered them when the fit ran, bytes changed by hand.
import { spawn } from "node:child_process";
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { strFromU8, strToU8, unzipSync, zipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import { stopRenderWorkers } from "@/lib/server/render/render-in-worker";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as analyses from "@/app/api/analyses/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as figureRoute from "@/app/api/figures/[id]/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as verifyRoute from "@/app/api/bundles/verify/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let figureId: string;
let analysisId: string;
/** The fitted parameters as POST /api/analyses answered them. */
let fitted: Array<{ name: string; value: number; stderr: number }>;
let bundle: Uint8Array;
let files: Record<string, Uint8Array>;
let dir: string;
const VL = "https://vega.github.io/schema/vega-lite/v6.json";
const sha256 = (b: Uint8Array | string) => createHash("sha256").update(b).digest("hex");
const post = (h: any, who: Who, params: Record<string, string>, body?: unknown) => call(h, { method: "POST", token: tokens[who], params, body });

interface Row {
  item: string;
  check: string;
  match: boolean;
  detail: string;
}

async function verify(zip: Uint8Array, who: Who = "viewer") {
  return call(verifyRoute.POST, { method: "POST", token: tokens[who], rawBody: uploadForm("bundle.zip", zip) });
}

/** The bundle with some entries replaced, zipped again. */
function rezip(changes: Record<string, Uint8Array>): Uint8Array {
  return zipSync({ ...files, ...changes });
}

/** The metadata with one file's sha256 and size rewritten to match new bytes (what a careful forger would do). */
function metadataFor(pathInZip: string, bytes: Uint8Array, metadata = files["ro-crate-metadata.json"]!): Uint8Array {
  const crate = JSON.parse(strFromU8(metadata));
  const e = crate["@graph"].find((x: any) => x["@id"] === pathInZip);
  e.sha256 = sha256(bytes);
  e.contentSize = String(bytes.byteLength);
  return strToU8(JSON.stringify(crate, null, 2));
}

/** Runs the CLI as `npm run verify` does: tsx with the react-server condition, from the project root. */
function runCli(zipPath: string): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    const child = spawn(path.join("node_modules", ".bin", "tsx"), ["--conditions=react-server", "scripts/verify-bundle.ts", zipPath], {
      cwd: process.cwd(),
      stdio: ["ignore", "pipe", "pipe"],
    });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (d: Buffer) => (stdout += d.toString("utf8")));
    child.stderr.on("data", (d: Buffer) => (stderr += d.toString("utf8")));
    child.on("close", (code) => resolve({ code, stdout, stderr }));
  });
}

const rawPath = () => Object.keys(files).find((f) => f.startsWith("raw/"))!;
const reportPath = () => `fits/hahn_echo-${analysisId}.json`;

beforeAll(async () => {
  ({ tokens, dir } = await setupTestApp());
  const echo = hahnEchoFiles()[0]!;
  const versionId = (
    await call(upload.POST, { method: "POST", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, rawBody: uploadForm(echo.fileName, echo.content) })
  ).json.id;
  const fit = await post(analyses.POST, "author", {}, { versionId, model: "hahn_echo", options: { x: "tau", y: "signal", sigma: "sigma" } });
  expect(fit.status).toBe(201);
  analysisId = fit.json.id;
  fitted = fit.json.parameters;
  figureId = (await post(figuresRoute.POST, "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Coherence", widthMm: 183, columns: 2 })).json.id;
  const shared = await call(figureRoute.PATCH, { method: "PATCH", token: tokens.author, params: { id: figureId }, body: { shareYTitles: true } });
  expect(shared.status).toBe(200);
  const enc = { x: { field: "tau", type: "quantitative", scale: { type: "log" } }, y: { field: "signal", type: "quantitative", title: "signal (norm.)" } };
  for (const spec of [
    {
      bindings: { echo: { versionId }, fit: { analysisId, output: "curve" } },
      spec: {
        $schema: VL,
        width: 200,
        height: 140,
        layer: [
          { data: { name: "echo" }, mark: "point", encoding: enc },
          { data: { name: "fit" }, mark: "line", encoding: enc },
        ],
      },
    },
    {
      bindings: { res: { analysisId, output: "residuals" }, value: { analysisId, output: "parameters" } },
      spec: {
        $schema: VL,
        width: 200,
        height: 140,
        layer: [
          { data: { name: "res" }, mark: "point", encoding: enc },
          {
            data: { name: "value" },
            transform: [{ filter: { field: "name", equal: "T2" } }],
            mark: { type: "text", align: "right", baseline: "top", x: "width", y: 0 },
            encoding: { text: { field: "text", type: "nominal" } },
          },
        ],
      },
    },
  ]) {
    const panelId = (await post(panelsRoute.POST, "author", { id: figureId }, {})).json.id;
    expect((await post(revisions.POST, "author", { id: panelId }, { baseRevisionId: null, ...spec })).status).toBe(201);
  }
  const { GET } = await import("@/app/api/figures/[id]/export/route");
  const res = await GET(new Request("http://localhost/x?format=bundle", { headers: { authorization: `Bearer ${tokens.viewer}` } }), {
    params: Promise.resolve({ id: figureId }),
  });
  expect(res.status).toBe(200);
  bundle = new Uint8Array(await res.arrayBuffer());
  files = unzipSync(bundle);
}, 180_000);
afterAll(async () => {
  await stopRenderWorkers();
});

describe("verifying a bundle", () => {
  it("an untouched bundle: every file, parse, panel's rows, fit and render matches", async () => {
    const r = await verify(bundle);
    expect(r.status).toBe(200);
    const rows: Row[] = r.json.rows;
    expect(rows.filter((x) => !x.match)).toEqual([]);
    expect(r.json.ok).toBe(true);
    expect(r.json.bundleSha256).toBe(sha256(bundle));

    // One hash check per file in the zip besides the metadata, named by its path.
    const inZip = Object.keys(files).filter((f) => f !== "ro-crate-metadata.json");
    expect(rows.filter((x) => x.check === "sha256").map((x) => x.item)).toEqual(expect.arrayContaining(inZip));
    expect(rows.filter((x) => x.check === "sha256")).toHaveLength(inZip.length);
    const shaOf = rows.find((x) => x.check === "sha256" && x.item === rawPath())!;
    expect(shaOf.detail).toContain(sha256(files[rawPath()]!).slice(0, 16));

    // The raw upload and the fit's derived file are parsed again.
    const derived = inZip.find((f) => f.startsWith("derived/"))!;
    expect(
      rows
        .filter((x) => x.check === "parse")
        .map((x) => x.item)
        .sort(),
    ).toEqual([derived, rawPath()].sort());
    // Each data name of each panel: the rows drawn, read again.
    expect(
      rows
        .filter((x) => x.check === "rows")
        .map((x) => x.item)
        .sort(),
    ).toEqual(["panel a · echo", "panel a · fit", "panel b · res", "panel b · value"]);
    // The echo file has 80 points (lib/demo-data/hahn-echo.ts: 80 log-spaced τ).
    expect(rows.find((x) => x.item === "panel a · echo")!.detail).toMatch(/^80 rows identical/);

    // The fit, run again: the values the analysis API answered when it ran.
    const fit = rows.filter((x) => x.check === "fit");
    expect(fit.map((x) => x.item)).toEqual([`fit ${analysisId} (${reportPath()})`]);
    for (const p of fitted) expect(fit[0]!.detail).toContain(`${p.name} = ${p.value}`);
    expect(fit[0]!.detail).toContain("on 80 points");

    // The figure drawn again, panel by panel and whole.
    expect(rows.filter((x) => x.check === "render").map((x) => x.item)).toEqual(["panel a", "panel b", "figure.svg"]);
    // The figure shares y titles: panel b, beside a, draws no "signal (norm.)" title of its own, and drawing it again did the same.
    expect(strFromU8(files["figure.svg"]!).match(/>signal \(norm\.\)<\/text>/g)).toHaveLength(1);
    expect(r.json.tolerances.fit).toMatch(/^1e-6 relative/);
    expect(r.json.tolerances.render).toMatch(/^identical SVG after canonicalisation/);
  });

  it("one byte of the raw file changed: the file is named, the bundle fails", async () => {
    const raw = files[rawPath()]!;
    const text = strFromU8(raw);
    // The last digit of the file (in its last data row) goes up by one.
    const at = text.search(/\d(?=\D*$)/);
    const tampered = strToU8(text.slice(0, at) + String((Number(text[at]) + 1) % 10) + text.slice(at + 1));
    expect(tampered.byteLength).toBe(raw.byteLength);
    const r = await verify(rezip({ [rawPath()]: tampered }));
    expect(r.status).toBe(200);
    expect(r.json.ok).toBe(false);
    const failed: Row[] = r.json.rows.filter((x: Row) => !x.match);
    const hashFailures = failed.filter((x) => x.check === "sha256");
    expect(hashFailures.map((x) => x.item)).toEqual([rawPath()]);
    expect(hashFailures[0]!.detail).toContain(sha256(raw).slice(0, 16));
    expect(hashFailures[0]!.detail).toContain(sha256(tampered).slice(0, 16));
    // Re-read from the changed bytes, the drawn rows no longer match the raw file.
    expect(failed.find((x) => x.item === "panel a · echo")?.detail).toMatch(/^row 80, /);
  });

  it("a changed raw file with its hash rewritten in the metadata is still caught by the parse, the rows and the fit", async () => {
    const text = strFromU8(files[rawPath()]!);
    const at = text.search(/\d(?=\D*$)/);
    const tampered = strToU8(text.slice(0, at) + String((Number(text[at]) + 1) % 10) + text.slice(at + 1));
    const r = await verify(rezip({ [rawPath()]: tampered, "ro-crate-metadata.json": metadataFor(rawPath(), tampered) }));
    expect(r.json.ok).toBe(false);
    const failed: Row[] = r.json.rows.filter((x: Row) => !x.match);
    expect(failed.filter((x) => x.check === "sha256")).toEqual([]);
    expect(failed.map((x) => [x.item, x.check])).toEqual(
      expect.arrayContaining([
        [rawPath(), "parse"],
        ["panel a · echo", "rows"],
        [`fit ${analysisId} (${reportPath()})`, "fit"],
      ]),
    );
  });

  it("a drawn value changed in the panel's data file, its hash rewritten: the rows check names the row and column", async () => {
    const file = "data/panel-a.json";
    const data = JSON.parse(strFromU8(files[file]!));
    const echo = data.data.echo as { columns: string[]; values: unknown[][] };
    const signal = echo.columns.indexOf("signal");
    const original = echo.values[signal]![4] as number;
    echo.values[signal]![4] = original + 0.5;
    const bytes = strToU8(JSON.stringify(data) + "\n");
    const r = await verify(rezip({ [file]: bytes, "ro-crate-metadata.json": metadataFor(file, bytes) }));
    expect(r.json.ok).toBe(false);
    const rows = (r.json.rows as Row[]).find((x) => x.item === "panel a · echo")!;
    expect(rows.match).toBe(false);
    expect(rows.detail).toBe(`row 5, signal: recorded ${original + 0.5}, re-read ${original} (from ${rawPath()})`);
    // Drawn from the recorded values, panel a no longer matches figure.svg either.
    expect((r.json.rows as Row[]).find((x) => x.item === "panel a" && x.check === "render")!.match).toBe(false);
  });

  it("a bundle made before the panel files were written column by column (a list of records) still checks out", async () => {
    const changed: Record<string, Uint8Array> = {};
    let metadata = files["ro-crate-metadata.json"]!;
    for (const file of Object.keys(files).filter((f) => /^data\/panel-\w+\.json$/.test(f))) {
      const data = JSON.parse(strFromU8(files[file]!));
      for (const bound of Object.values(data.data) as Array<{ columns?: string[]; values?: unknown[][]; rows?: unknown[] }>) {
        const { columns, values } = bound;
        bound.rows = values![0]!.map((_, i) => Object.fromEntries(columns!.map((c, j) => [c, values![j]![i]])));
        delete bound.columns;
        delete bound.values;
      }
      changed[file] = strToU8(JSON.stringify(data) + "\n");
      metadata = metadataFor(file, changed[file], metadata);
    }
    const r = await verify(rezip({ ...changed, "ro-crate-metadata.json": metadata }));
    expect((r.json.rows as Row[]).filter((x) => !x.match)).toEqual([]);
    expect(r.json.ok).toBe(true);
  });

  it("a fit report's parameter changed: the report and the fit are named, with both numbers", async () => {
    const report = JSON.parse(strFromU8(files[reportPath()]!));
    const t2 = report.result.parameters.find((p: any) => p.name === "T2");
    const original = t2.value as number;
    t2.value = original * 1.001; // 1e-3 relative: a thousand times the tolerance
    const bytes = strToU8(JSON.stringify(report, null, 2) + "\n");
    for (const zip of [rezip({ [reportPath()]: bytes }), rezip({ [reportPath()]: bytes, "ro-crate-metadata.json": metadataFor(reportPath(), bytes) })]) {
      const r = await verify(zip);
      expect(r.json.ok).toBe(false);
      const fit = (r.json.rows as Row[]).find((x) => x.check === "fit")!;
      expect(fit.item).toBe(`fit ${analysisId} (${reportPath()})`);
      expect(fit.match).toBe(false);
      expect(fit.detail).toContain(`T2: recorded ${original * 1.001}, re-fitted ${original}`);
      // The panel that draws the fitted value reads it from the report: its rows differ too.
      expect((r.json.rows as Row[]).find((x) => x.item === "panel b · value")!.match).toBe(false);
    }
    const hashRows = (await verify(rezip({ [reportPath()]: bytes }))).json.rows.filter((x: Row) => x.check === "sha256" && !x.match);
    expect(hashRows.map((x: Row) => x.item)).toEqual([reportPath()]);
  });

  it("a changed figure.svg is caught by drawing the figure again, with its panel named", async () => {
    const svg = strFromU8(files["figure.svg"]!);
    // The first circle's position in panel b moved by a thousandth of a point.
    const at = svg.indexOf('<g class="panel panel-b"');
    const tampered = svg.slice(0, at) + svg.slice(at).replace(/(\d)(["\s,])/, (_m, d: string, end: string) => `${d}1${end}`);
    expect(tampered).not.toBe(svg);
    const bytes = strToU8(tampered);
    const r = await verify(rezip({ "figure.svg": bytes, "ro-crate-metadata.json": metadataFor("figure.svg", bytes) }));
    const render = (r.json.rows as Row[]).filter((x) => x.check === "render");
    expect(render.map((x) => [x.item, x.match])).toEqual([
      ["panel a", true],
      ["panel b", false],
      ["figure.svg", false],
    ]);
  });

  it("the command line exits 0 on the bundle and non-zero on a tampered one, naming the file", async () => {
    const good = path.join(dir, "bundle.zip");
    fs.writeFileSync(good, bundle);
    const ok = await runCli(good);
    expect(ok.stderr).toBe("");
    expect(ok.code).toBe(0);
    expect(ok.stdout).toMatch(/^All \d+ checks match\.$/m);
    expect(ok.stdout).toContain("fit: 1e-6 relative");

    const raw = files[rawPath()]!;
    const tampered = new Uint8Array(raw);
    tampered[tampered.length - 2] = tampered[tampered.length - 2]! ^ 0x01;
    const bad = path.join(dir, "tampered.zip");
    fs.writeFileSync(bad, rezip({ [rawPath()]: tampered }));
    const fail = await runCli(bad);
    expect(fail.code).toBe(1);
    expect(fail.stdout).toMatch(new RegExp(`^${rawPath().replace(/[.*+?^${}()|[\]\\]/g, "\\$&")}\\s+sha256\\s+MISMATCH`, "m"));
    expect(fail.stdout).toContain(`do not match: ${rawPath()}`);
  }, 120_000);

  it("refuses an archive that is not a zip, or that holds an unsafe path; needs a signed-in user", async () => {
    const notZip = await verify(strToU8("not a zip at all"));
    expect(notZip.status).toBe(422);
    expect(notZip.json.error.message).toMatch(/^Not a readable zip archive/);
    const escape = await verify(zipSync({ "../outside.txt": strToU8("x"), "ro-crate-metadata.json": strToU8("{}") }));
    expect(escape.status).toBe(422);
    expect(escape.json.error.message).toContain('"../outside.txt"');
    const noMetadata = await verify(zipSync({ "note.txt": strToU8("x") }));
    expect(noMetadata.status).toBe(200);
    expect(noMetadata.json.ok).toBe(false);
    expect(noMetadata.json.rows).toEqual([
      { item: "ro-crate-metadata.json", check: "bundle", match: false, detail: "ro-crate-metadata.json is missing from the bundle" },
    ]);
    expect((await call(verifyRoute.POST, { method: "POST", rawBody: uploadForm("bundle.zip", bundle) })).status).toBe(401);
  });
});
