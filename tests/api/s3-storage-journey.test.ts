// The whole path on object storage: with STORAGE=s3 (a local fake S3 server, s3rver, started here)
// an upload is parsed and stored in the bucket, never under the uploads folder; a fit reads it back
// (its column cache rebuilt from the object), the raw download and the reproducibility bundle carry
// the same bytes, and a backup copies the object. Expected hashes are of the file as written here,
// with node:crypto — not the store's own hashing.
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { unzipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { resetEnvForTests } from "@/lib/env";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import { createBackup } from "@/lib/server/backup/backup";
import { stopRenderWorkers } from "@/lib/server/render/render-in-worker";
import { blobStore } from "@/lib/server/storage/store";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as analyses from "@/app/api/analyses/route";
import * as raw from "@/app/api/versions/[id]/raw/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import { startFakeS3, type FakeS3 } from "../support/fake-s3";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

const VL = "https://vega.github.io/schema/vega-lite/v6.json";
const echo = hahnEchoFiles()[0]!;
const expectedSha = createHash("sha256").update(echo.content).digest("hex");

let fake: FakeS3;
let dir: string;
let tokens: Record<Who, string>;
let versionId: string;
let sha256: string;

/** Files under the uploads folder other than part files and derived caches: there must be none. */
function storedOnDisk(): string[] {
  const up = path.join(dir, "uploads");
  if (!fs.existsSync(up)) return [];
  return fs.readdirSync(up).filter((name) => name !== "tmp" && name !== "cache");
}

beforeAll(async () => {
  fake = await startFakeS3();
  Object.assign(process.env, fake.env);
  ({ dir, tokens } = await setupTestApp());
});

afterAll(async () => {
  await stopRenderWorkers();
  for (const k of Object.keys(fake.env)) delete process.env[k];
  resetEnvForTests();
  await fake.close();
});

describe("upload → parse → fit → export with STORAGE=s3", () => {
  it("stores the upload as an object in the bucket and nothing under the uploads folder", async () => {
    expect(blobStore().kind).toBe("s3");
    const res = await call(upload.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: DEMO_MANUSCRIPT_ID },
      rawBody: uploadForm(echo.fileName, echo.content),
    });
    expect(res.status).toBe(201);
    versionId = res.json.id;
    sha256 = res.json.sha256;
    expect(sha256).toBe(expectedSha);
    expect(res.json.rowCount).toBeGreaterThan(0);
    expect(await blobStore().stat(sha256)).toMatchObject({ size: Buffer.byteLength(echo.content) });
    expect(storedOnDisk()).toEqual([]);
  });

  it("fits after the local column cache is gone: it is rebuilt from the object", async () => {
    fs.rmSync(path.join(dir, "uploads", "cache"), { recursive: true, force: true });
    const fit = await call(analyses.POST, {
      method: "POST",
      token: tokens.author,
      body: { versionId, model: "hahn_echo", options: { x: "tau", y: "signal", sigma: "sigma" } },
    });
    expect(fit.status).toBe(201);
    expect(Number.isFinite(fit.json.parameters.find((p: { name: string }) => p.name === "T2").value)).toBe(true);
    expect(fs.existsSync(path.join(dir, "uploads", "cache", `${sha256}.columns`))).toBe(true);
    // The temporary copy downloaded for the parse is gone.
    expect(fs.readdirSync(path.join(dir, "uploads", "tmp"))).toEqual([]);
  });

  it("serves the raw bytes from the bucket", async () => {
    const res = await raw.GET!(new Request(`http://localhost/api/versions/${versionId}/raw`, { headers: { authorization: `Bearer ${tokens.viewer}` } }), {
      params: Promise.resolve({ id: versionId }),
    });
    expect(res.status).toBe(200);
    expect(res.headers.get("x-content-sha256")).toBe(expectedSha);
    expect(
      createHash("sha256")
        .update(new Uint8Array(await res.arrayBuffer()))
        .digest("hex"),
    ).toBe(expectedSha);
  });

  it("puts the same bytes into the reproducibility bundle", async () => {
    const figureId = (
      await call(figuresRoute.POST, {
        method: "POST",
        token: tokens.author,
        body: { manuscriptId: DEMO_MANUSCRIPT_ID, title: "On S3", widthMm: 89, columns: 1 },
      })
    ).json.id;
    const panelId = (await call(panelsRoute.POST, { method: "POST", token: tokens.author, params: { id: figureId }, body: {} })).json.id;
    const saved = await call(revisions.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: panelId },
      body: {
        baseRevisionId: null,
        bindings: { echo: { versionId } },
        spec: {
          $schema: VL,
          width: 200,
          height: 140,
          data: { name: "echo" },
          mark: "point",
          encoding: { x: { field: "tau", type: "quantitative", title: "τ (µs)" }, y: { field: "signal", type: "quantitative", title: "signal" } },
        },
      },
    });
    expect(saved.status).toBe(201);
    const { GET } = await import("@/app/api/figures/[id]/export/route");
    const res = await GET!(
      new Request(`http://localhost/api/figures/${figureId}/export?format=bundle`, { headers: { authorization: `Bearer ${tokens.viewer}` } }),
      {
        params: Promise.resolve({ id: figureId }),
      },
    );
    expect(res.status).toBe(200);
    const files = unzipSync(new Uint8Array(await res.arrayBuffer()));
    const rawFiles = Object.keys(files).filter((p) => p.startsWith("raw/"));
    expect(rawFiles).toEqual([`raw/${expectedSha.slice(0, 12)}-${echo.fileName.replace(/[^\w.-]+/g, "_")}`]);
    expect(createHash("sha256").update(files[rawFiles[0]!]!).digest("hex")).toBe(expectedSha);
  });

  it("backs up the object with its hash", async () => {
    const manifest = await createBackup(path.join(dir, "backup"));
    expect(manifest.blobs).toContainEqual({ sha256: expectedSha, bytes: Buffer.byteLength(echo.content) });
  });
});
