// The whole path on object storage: with STORAGE=s3 (a local fake S3 server, s3rver, started here)
// an upload is parsed and stored in the bucket with its parsed columns, never under the uploads
// folder; a fit reads it back (the columns rebuilt from the object when they are gone), the raw
// download and the reproducibility bundle carry the same bytes, and a backup copies the object.
// Expected hashes are of the file as written here, with node:crypto — not the store's own hashing.
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { DeleteObjectCommand, HeadObjectCommand, S3Client } from "@aws-sdk/client-s3";
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

/** Anything under the uploads folder but part files: there must be nothing (stored and derived files are in the bucket). */
function storedOnDisk(): string[] {
  const up = path.join(dir, "uploads");
  if (!fs.existsSync(up)) return [];
  return fs.readdirSync(up).filter((name) => name !== "tmp");
}

function bucket() {
  const client = new S3Client({
    endpoint: fake.env.S3_ENDPOINT,
    region: fake.env.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: fake.env.S3_ACCESS_KEY_ID!, secretAccessKey: fake.env.S3_SECRET_ACCESS_KEY! },
  });
  return { client, Bucket: fake.env.S3_BUCKET! };
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

  it("keeps the parsed columns in the bucket; a fit after they are gone rebuilds them from the object", async () => {
    const { client, Bucket } = bucket();
    const Key = `cache/${sha256}.columns`;
    await client.send(new HeadObjectCommand({ Bucket, Key }));
    await client.send(new DeleteObjectCommand({ Bucket, Key }));
    const fit = await call(analyses.POST, {
      method: "POST",
      token: tokens.author,
      body: { versionId, model: "hahn_echo", options: { x: "tau", y: "signal", sigma: "sigma" } },
    });
    expect(fit.status).toBe(201);
    expect(Number.isFinite(fit.json.parameters.find((p: { name: string }) => p.name === "T2").value)).toBe(true);
    expect((await client.send(new HeadObjectCommand({ Bucket, Key }))).ContentLength).toBeGreaterThan(0);
    client.destroy();
    expect(storedOnDisk()).toEqual([]);
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
