import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import { stopRenderWorkers } from "@/lib/server/render/render-in-worker";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as figureRoute from "@/app/api/figures/[id]/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as panelRoute from "@/app/api/panels/[id]/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as figureThumb from "@/app/api/figures/[id]/thumbnail/route";
import * as panelThumb from "@/app/api/panels/[id]/thumbnail/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let dir: string;
let tokens: Record<Who, string>;
let versionId: string;
let figureId: string;
let panelA: string;
let panelB: string;
let revA: string;
const VL = "https://vega.github.io/schema/vega-lite/v6.json";
const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/** The route's answer with its raw bytes (the harness's `call` reads text). */
async function thumb(kind: "figure" | "panel", id: string, who: Who | null = "viewer", headers: Record<string, string> = {}, query = "") {
  const route = kind === "figure" ? figureThumb : panelThumb;
  const h = new Headers(headers);
  if (who) h.set("authorization", `Bearer ${tokens[who]}`);
  const res = await route.GET(new Request(`http://localhost/api/${kind}s/${id}/thumbnail${query}`, { headers: h }), { params: Promise.resolve({ id }) });
  return { status: res.status, headers: res.headers, bytes: new Uint8Array(await res.arrayBuffer()) };
}

const cacheFile = (kind: "figure" | "panel", hash: string) => path.join(dir, "uploads", "cache", "thumbs", `${kind}-${hash}.png`);
const figureHash = async () => (await call(figureRoute.GET, { token: tokens.viewer, params: { id: figureId } })).json.figureHash as string;
const pngWidth = (b: Uint8Array) => new DataView(b.buffer, b.byteOffset).getUint32(16);

function spec(yTitle: string) {
  return {
    $schema: VL,
    width: 200,
    height: 140,
    data: { name: "echo" },
    mark: "point",
    encoding: { x: { field: "tau", type: "quantitative", scale: { type: "log" } }, y: { field: "signal", type: "quantitative", title: yTitle } },
  };
}

async function revise(panelId: string, baseRevisionId: string | null, yTitle: string): Promise<string> {
  const r = await call(revisions.POST, {
    method: "POST",
    token: tokens.author,
    params: { id: panelId },
    body: { baseRevisionId, bindings: { echo: { versionId } }, spec: spec(yTitle) },
  });
  expect(r.status, JSON.stringify(r.json)).toBe(201);
  return r.json.id;
}

beforeAll(async () => {
  ({ dir, tokens } = await setupTestApp());
  const echo = hahnEchoFiles()[0]!;
  versionId = (
    await call(upload.POST, { method: "POST", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, rawBody: uploadForm(echo.fileName, echo.content) })
  ).json.id;
  figureId = (
    await call(figuresRoute.POST, { method: "POST", token: tokens.author, body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Thumbnails", columns: 2 } })
  ).json.id;
  const add = async () => (await call(panelsRoute.POST, { method: "POST", token: tokens.author, params: { id: figureId }, body: {} })).json.id as string;
  panelA = await add();
  panelB = await add(); // stays without a revision until the last test
  revA = await revise(panelA, null, "signal (norm.)");
}, 120_000);
afterAll(async () => {
  await stopRenderWorkers();
});

describe("figure thumbnails", () => {
  it("answers a member a PNG, cached on disk by figure hash, with the hash as ETag", async () => {
    const hash = await figureHash();
    expect(fs.existsSync(cacheFile("figure", hash))).toBe(false);
    const first = await thumb("figure", figureId);
    expect(first.status).toBe(200);
    expect(first.headers.get("content-type")).toBe("image/png");
    expect([...first.bytes.slice(0, 8)]).toEqual(PNG_SIGNATURE);
    expect(pngWidth(first.bytes)).toBe(480);
    expect(first.headers.get("etag")).toBe(`"${hash}"`);
    expect(first.headers.get("cache-control")).toMatch(/^private, max-age=\d+$/);
    expect(first.headers.get("x-thumbnail")).toBe("ok");
    expect(fs.existsSync(cacheFile("figure", hash))).toBe(true);

    const second = await thumb("figure", figureId, "reviewer");
    expect(second.status).toBe(200);
    expect(Buffer.from(second.bytes).equals(Buffer.from(first.bytes))).toBe(true);
    expect(Buffer.from(fs.readFileSync(cacheFile("figure", hash))).equals(Buffer.from(first.bytes))).toBe(true);
  }, 60_000);

  it("answers from the cache file, and 304 to a browser that has the hash", async () => {
    const hash = await figureHash();
    await thumb("figure", figureId);
    const file = cacheFile("figure", hash);
    const original = fs.readFileSync(file);
    // A marked copy in the cache is what comes back: no second render.
    const marked = Buffer.concat([original, Buffer.from("cache-hit")]);
    fs.writeFileSync(file, marked);
    try {
      expect(Buffer.from((await thumb("figure", figureId)).bytes).equals(marked)).toBe(true);
    } finally {
      fs.writeFileSync(file, original);
    }
    const again = await thumb("figure", figureId, "viewer", { "if-none-match": `"${hash}"` });
    expect(again.status).toBe(304);
    expect(again.bytes.byteLength).toBe(0);
    expect(again.headers.get("etag")).toBe(`"${hash}"`);
  }, 60_000);

  it("a URL naming the current hash may be kept long; one naming an old hash only briefly", async () => {
    const hash = await figureHash();
    const current = await thumb("figure", figureId, "viewer", {}, `?v=${hash.slice(0, 16)}`);
    expect(current.headers.get("cache-control")).toBe("private, max-age=86400");
    const old = await thumb("figure", figureId, "viewer", {}, `?v=${"0".repeat(16)}`);
    expect(old.headers.get("cache-control")).toBe("private, max-age=60");
    expect((await thumb("figure", figureId, "viewer", {}, "?v=not-a-hash")).status).toBe(400);
  }, 60_000);

  it("is 404 for an outsider and 401 without a token", async () => {
    expect((await thumb("figure", figureId, "outsider")).status).toBe(404);
    expect((await thumb("panel", panelA, "outsider")).status).toBe(404);
    expect((await thumb("figure", figureId, null)).status).toBe(401);
    expect((await thumb("figure", "no-such-figure")).status).toBe(404);
  });

  it("a figure with no panels answers a placeholder, not an error", async () => {
    const empty = (await call(figuresRoute.POST, { method: "POST", token: tokens.author, body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Empty" } })).json.id;
    const r = await thumb("figure", empty);
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toBe("image/png");
    expect(r.headers.get("x-thumbnail")).toBe("empty");
    expect([...r.bytes.slice(0, 8)]).toEqual(PNG_SIGNATURE);
  });
});

describe("panel thumbnails", () => {
  it("draws the current revision, cached by its content hash", async () => {
    const rev = (await call(panelRoute.GET, { token: tokens.viewer, params: { id: panelA } })).json.currentRevision;
    const first = await thumb("panel", panelA);
    expect(first.status).toBe(200);
    expect([...first.bytes.slice(0, 8)]).toEqual(PNG_SIGNATURE);
    expect(first.headers.get("etag")).toBe(`"${rev.contentHash}"`);
    expect(fs.existsSync(cacheFile("panel", rev.contentHash))).toBe(true);
    const second = await thumb("panel", panelA, "pi");
    expect(Buffer.from(second.bytes).equals(Buffer.from(first.bytes))).toBe(true);
  }, 60_000);

  it("a panel without a revision answers a placeholder", async () => {
    const r = await thumb("panel", panelB);
    expect(r.status).toBe(200);
    expect(r.headers.get("x-thumbnail")).toBe("empty");
    expect([...r.bytes.slice(0, 8)]).toEqual(PNG_SIGNATURE);
  });
});

describe("a new revision", () => {
  it("changes the hash and with it the picture, for the panel and the figure", async () => {
    const oldFigureHash = await figureHash();
    const oldFigure = await thumb("figure", figureId);
    const oldPanel = await thumb("panel", panelA);
    await revise(panelA, revA, "echo amplitude (arb. u.)");
    await revise(panelB, null, "second panel");

    const newFigureHash = await figureHash();
    expect(newFigureHash).not.toBe(oldFigureHash);
    const newFigure = await thumb("figure", figureId);
    expect(newFigure.status).toBe(200);
    expect(newFigure.headers.get("etag")).toBe(`"${newFigureHash}"`);
    expect(Buffer.from(newFigure.bytes).equals(Buffer.from(oldFigure.bytes))).toBe(false);
    expect(fs.existsSync(cacheFile("figure", newFigureHash))).toBe(true);

    const newPanel = await thumb("panel", panelA);
    expect(newPanel.headers.get("etag")).not.toBe(oldPanel.headers.get("etag"));
    expect(Buffer.from(newPanel.bytes).equals(Buffer.from(oldPanel.bytes))).toBe(false);
    expect((await thumb("panel", panelB)).headers.get("x-thumbnail")).toBe("ok");
  }, 120_000);
});
