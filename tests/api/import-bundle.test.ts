// Importing a reproducibility bundle into another manuscript: export → import → export gives the same
// hashes for every data file and the same rows in every panel; unsafe archives are refused and leave
// nothing behind. Expected values come from outside the importer: hashes recomputed here with
// node:crypto from the unzipped bundles, archives built here byte by byte.
import { createHash } from "node:crypto";
import { strFromU8, strToU8, unzipSync, zipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, datasets, figures } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import { stopRenderWorkers } from "@/lib/server/render/render-in-worker";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as manuscripts from "@/app/api/manuscripts/route";
import * as analysesRoute from "@/app/api/analyses/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as importRoute from "@/app/api/manuscripts/[id]/bundles/import/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let target: string;
let bundle: Uint8Array;
let files: Record<string, Uint8Array>;
const VL = "https://vega.github.io/schema/vega-lite/v6.json";
const sha256 = (b: Uint8Array) => createHash("sha256").update(b).digest("hex");
const post = (h: any, who: Who, params: Record<string, string>, body?: unknown) => call(h, { method: "POST", token: tokens[who], params, body });

async function exportBundle(figureId: string): Promise<Uint8Array> {
  const { GET } = await import("@/app/api/figures/[id]/export/route");
  const res = await GET(new Request("http://localhost/x?format=bundle", { headers: { authorization: `Bearer ${tokens.author}` } }), {
    params: Promise.resolve({ id: figureId }),
  });
  expect(res.status).toBe(200);
  return new Uint8Array(await res.arrayBuffer());
}

const importInto = (manuscriptId: string, zip: Uint8Array, who: Who = "author") =>
  call(importRoute.POST, { method: "POST", token: tokens[who], params: { id: manuscriptId }, rawBody: uploadForm("bundle.zip", zip) });

/** Data files of a bundle by path, with their SHA-256 computed here. */
function dataHashes(entries: Record<string, Uint8Array>): Record<string, string> {
  return Object.fromEntries(
    Object.entries(entries)
      .filter(([p]) => p.startsWith("raw/") || p.startsWith("derived/"))
      .map(([p, b]) => [p, sha256(b)]),
  );
}

/** The rows each panel was drawn from, by panel and data name. */
function panelRows(entries: Record<string, Uint8Array>) {
  return Object.fromEntries(
    Object.entries(entries)
      .filter(([p]) => /^data\/panel-\w+\.json$/.test(p))
      .map(([p, b]) => {
        const d = JSON.parse(strFromU8(b)) as { data: Record<string, { columns: string[]; values: unknown[][] }> };
        return [p, Object.fromEntries(Object.entries(d.data).map(([name, v]) => [name, { columns: v.columns, values: v.values }]))];
      }),
  );
}

async function countIn(manuscriptId: string) {
  const db = getDb();
  return {
    datasets: (await db.select().from(datasets).where(eq(datasets.manuscriptId, manuscriptId))).length,
    analyses: (await db.select().from(analyses).where(eq(analyses.manuscriptId, manuscriptId))).length,
    figures: (await db.select().from(figures).where(eq(figures.manuscriptId, manuscriptId))).length,
  };
}

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const echo = hahnEchoFiles()[0]!;
  const versionId = (
    await call(upload.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: DEMO_MANUSCRIPT_ID },
      rawBody: uploadForm(echo.fileName, echo.content, { name: echo.name, metadata: JSON.stringify({ kind: echo.kind, sample: "K17", tags: echo.tags }) }),
    })
  ).json.id;
  const fit = await post(analysesRoute.POST, "author", {}, { versionId, model: "hahn_echo", options: { x: "tau", y: "signal", sigma: "sigma" } });
  expect(fit.status).toBe(201);
  const figureId = (await post(figuresRoute.POST, "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Coherence", widthMm: 183, columns: 2 })).json.id;
  const enc = { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative", title: "signal (norm.)" } };
  for (const spec of [
    {
      bindings: { echo: { versionId }, fit: { analysisId: fit.json.id, output: "curve" } },
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
      bindings: { res: { analysisId: fit.json.id, output: "residuals" } },
      spec: { $schema: VL, width: 200, height: 140, data: { name: "res" }, mark: "point", encoding: enc },
    },
  ]) {
    const panelId = (await post(panelsRoute.POST, "author", { id: figureId }, {})).json.id;
    expect((await post(revisions.POST, "author", { id: panelId }, { baseRevisionId: null, message: "first cut", ...spec })).status).toBe(201);
  }
  bundle = await exportBundle(figureId);
  files = unzipSync(bundle);
  // The author starts a manuscript of their own (another group's instance, in effect).
  const m = await post(manuscripts.POST, "author", {}, { title: "Replication", labId: "demo-lab" });
  expect(m.status).toBe(201);
  target = m.json.id;
}, 180_000);

afterAll(async () => {
  await stopRenderWorkers();
});

describe("importing a bundle", () => {
  it("export → import → export: the same data files by hash, the same rows in every panel, the fits as recorded", async () => {
    const r = await importInto(target, bundle);
    expect(r.status).toBe(201);
    expect(r.json.bundleSha256).toBe(sha256(bundle));
    expect(r.json.panels).toBe(2);
    expect(r.json.analyses).toBe(1);
    expect(r.json.datasets).toHaveLength(1);
    expect(r.json.note).toMatch(/not|again/);

    const again = unzipSync(await exportBundle(r.json.figureId));
    expect(Object.keys(dataHashes(files)).length).toBe(2); // one raw file, one derived file
    expect(dataHashes(again)).toEqual(dataHashes(files));
    expect(panelRows(again)).toEqual(panelRows(files));
    const fitOf = (entries: Record<string, Uint8Array>) => {
      const path = Object.keys(entries).find((p) => p.startsWith("fits/") && p.endsWith(".json"))!;
      return (JSON.parse(strFromU8(entries[path])) as { result: { parameters: unknown } }).result.parameters;
    };
    expect(fitOf(again)).toEqual(fitOf(files));

    // Marked as imported, with the group's review to do again.
    const imported = await getDb().select().from(datasets).where(eq(datasets.manuscriptId, target));
    const source = imported.find((d) => !d.tags.derivedFrom)!;
    expect(source.kind).toBe("hahn_echo");
    expect(source.sample).toBe("K17");
    expect(source.notes).toContain(`Imported from bundle ${sha256(bundle)}`);
    const trace = JSON.parse(strFromU8(again["trace.json"])) as { panels: Array<{ revision: { message: string } }>; decisions: unknown[]; signoffs: unknown[] };
    for (const p of trace.panels)
      expect(p.revision.message).toMatch(new RegExp(`^Imported from bundle ${sha256(bundle)} \\(panel [ab], revision 1 by .+: “first cut”\\)\\.$`));
    expect(trace.decisions).toEqual([]);
    expect(trace.signoffs).toEqual([]);
  }, 180_000);

  it("a reviewer may not import (403), an outsider learns nothing (404)", async () => {
    expect((await importInto(DEMO_MANUSCRIPT_ID, bundle, "reviewer")).status).toBe(403);
    expect((await importInto(target, bundle, "outsider")).status).toBe(404);
  });

  it("a bundle with one byte changed does not verify and imports nothing", async () => {
    const raw = Object.keys(files).find((p) => p.startsWith("raw/"))!;
    const changed = Uint8Array.from(files[raw]);
    changed[changed.length - 2] ^= 1;
    const before = await countIn(target);
    const r = await importInto(target, zipSync({ ...files, [raw]: changed }));
    expect(r.status).toBe(422);
    expect(r.json.error.message).toContain(`The bundle does not verify, so nothing was imported: ${raw}`);
    expect(await countIn(target)).toEqual(before);
  }, 120_000);

  /** Two entries "a.txt" and "b.txt", the second renamed to "a.txt" in its local and central headers. */
  function duplicateNames(): Uint8Array {
    const zip = zipSync({ "a.txt": strToU8("one"), "b.txt": strToU8("two") }, { level: 0 });
    const text = Buffer.from(zip);
    let at = text.indexOf("b.txt");
    while (at >= 0) {
      text.write("a.txt", at, "latin1");
      at = text.indexOf("b.txt", at + 1);
    }
    return new Uint8Array(text);
  }

  /** A one-entry zip whose central directory says the entry unpacks to 10 bytes when it holds 5,000. */
  function lyingSize(): Uint8Array {
    const zip = zipSync({ "data.csv": strToU8("1,2\n".repeat(1250)) });
    const view = new DataView(zip.buffer, zip.byteOffset, zip.byteLength);
    for (let i = zip.byteLength - 22; i >= 0; i--)
      if (view.getUint32(i, true) === 0x06054b50) {
        const central = view.getUint32(i + 16, true);
        view.setUint32(central + 24, 10, true);
        break;
      }
    return zip;
  }

  const hostile: Array<[string, () => Uint8Array, RegExp]> = [
    ["a path climbing out with ..", () => zipSync({ "../escape.csv": strToU8("1,2\n") }), /unsafe path: "\.\.\/escape\.csv"/],
    ["an absolute path", () => zipSync({ "/etc/cron.d/x": strToU8("1,2\n") }), /unsafe path: "\/etc\/cron\.d\/x"/],
    [
      "a symbolic link",
      () => zipSync({ "raw/link.csv": [strToU8("/etc/passwd"), { os: 3, attrs: 0o120777 << 16 }] }),
      /holds a link, which is refused: "raw\/link\.csv"/,
    ],
    ["a name twice", duplicateNames, /holds "a\.txt" twice/],
    [
      "10,001 entries",
      () => zipSync(Object.fromEntries(Array.from({ length: 10_001 }, (_, i) => [`f${i}.txt`, strToU8("x")])), { level: 0 }),
      /more than 10000 entries/,
    ],
    ["a ratio over 100×", () => zipSync({ "zeros.csv": new Uint8Array(4 * 1024 * 1024) }, { level: 9 }), /compressed more than 100×/],
    ["a header that lies about the size", lyingSize, /declares 10 bytes|Not a readable zip|does not verify/],
    ["bytes that are not a zip", () => strToU8("this is a spreadsheet, honestly"), /Not a readable zip archive/],
  ];
  for (const [what, make, message] of hostile) {
    it(`refuses ${what} and writes nothing`, async () => {
      const before = await countIn(target);
      const r = await importInto(target, make());
      expect(r.status).toBe(422);
      expect(r.json.error.message).toMatch(message);
      expect(await countIn(target)).toEqual(before);
    });
  }
});
