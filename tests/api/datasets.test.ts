import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, datasets, versions } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import * as list from "@/app/api/manuscripts/[id]/datasets/route";
import * as dataset from "@/app/api/datasets/[id]/route";
import * as version from "@/app/api/versions/[id]/route";
import * as raw from "@/app/api/versions/[id]/raw/route";
import * as rows from "@/app/api/versions/[id]/rows/route";
import * as plot from "@/app/api/versions/[id]/plot/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let dir: string;
beforeAll(async () => {
  process.env.UPLOAD_MAX_BYTES = String(1024 * 1024);
  ({ tokens, dir } = await setupTestApp());
});

const params = { id: DEMO_MANUSCRIPT_ID };
const upload = (form: FormData, who: Who = "author") => call(list.POST, { method: "POST", token: tokens[who], params, rawBody: form });
const ECHO = "# sample: K17\n# instrument: confocal setup A\ntau (µs),signal,sigma\n1,0.98,0.01\n2,0.95,0.01\n\n4,0.90,0.01\n8,0.81,0.01\n";

describe("uploads", () => {
  it("stores a version with hash, rows, columns with units and header metadata", async () => {
    const r = await upload(
      uploadForm("echo NV03.csv", ECHO, {
        name: "Hahn echo NV03",
        metadata: JSON.stringify({ kind: "hahn_echo", sample: "K17", tags: { group: "annealed" } }),
      }),
    );
    expect(r.status).toBe(201);
    expect(r.json).toMatchObject({ number: 1, rowCount: 4, byteSize: Buffer.byteLength(ECHO) });
    expect(r.json.sha256).toBe(createHash("sha256").update(ECHO, "utf8").digest("hex")); // of the bytes sent
    expect(r.json.columns).toEqual([
      { name: "tau", unit: "µs", type: "number", header: "tau (µs)" },
      { name: "signal", unit: null, type: "number", header: "signal" },
      { name: "sigma", unit: null, type: "number", header: "sigma" },
    ]);
    expect(r.json.warnings.join(" ")).toMatch(/blank line/);
    expect(r.json.parse.headerMetadata).toMatchObject({ sample: "K17" });
    const ds = await call(dataset.GET, { token: tokens.viewer, params: { id: r.json.datasetId } });
    expect(ds.json).toMatchObject({ name: "Hahn echo NV03", kind: "hahn_echo", sample: "K17", tags: { group: "annealed" } });
  });

  it("the raw download is byte-for-byte, with a safely encoded file name", async () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...Buffer.from("f (MHz);PL\r\n2870,5;0,97\r\n2871,0;0,96\r\n")]);
    const r = await upload(uploadForm("spectre été ✓.csv", bytes));
    expect(r.status).toBe(201);
    const res = await raw.GET(new Request("http://localhost/x", { headers: { authorization: `Bearer ${tokens.viewer}` } }), {
      params: Promise.resolve({ id: r.json.id }),
    });
    expect(res.status).toBe(200);
    expect(new Uint8Array(await res.arrayBuffer())).toEqual(bytes);
    const cd = res.headers.get("content-disposition")!;
    expect(cd).toContain(`filename*=UTF-8''${encodeURIComponent("spectre été ✓.csv")}`);
    expect(cd).toContain('filename="spectre _t_ _.csv"');
    expect(res.headers.get("x-content-sha256")).toBe(createHash("sha256").update(bytes).digest("hex"));
    expect(r.json.sha256).toBe(res.headers.get("x-content-sha256"));
  });

  it("identical bytes are stored once; the same bytes as a new version answer the current version", async () => {
    const a = await upload(uploadForm("a.csv", "x,y\n1,2\n3,4\n"));
    const b = await upload(uploadForm("b.csv", "x,y\n1,2\n3,4\n"));
    expect(b.status).toBe(201);
    expect(b.json.sha256).toBe(a.json.sha256);
    const stored = path.join(dir, "uploads", a.json.sha256.slice(0, 2), a.json.sha256.slice(2, 4), a.json.sha256);
    expect(fs.readFileSync(stored, "utf8")).toBe("x,y\n1,2\n3,4\n");
    const again = await upload(uploadForm("a.csv", "x,y\n1,2\n3,4\n", { datasetId: a.json.datasetId }));
    expect(again.status).toBe(200);
    expect(again.json).toMatchObject({ id: a.json.id, deduplicated: true });
  });

  it("a new version gets the next number and leaves the old one intact", async () => {
    const v1 = await upload(uploadForm("t1.csv", "t (ms),p\n0.1,1\n1,0.5\n"));
    const v2 = await upload(uploadForm("t1.csv", "t (ms),p\n0.1,1\n1,0.4\n", { datasetId: v1.json.datasetId }));
    expect(v2.status).toBe(201);
    expect(v2.json.number).toBe(2);
    const ds = await call(dataset.GET, { token: tokens.pi, params: { id: v1.json.datasetId } });
    expect(ds.json.versions.map((v: any) => v.number)).toEqual([2, 1]);
    const old = await call(rows.GET, { token: tokens.pi, params: { id: v1.json.id }, path: "/x?offset=0&limit=10" });
    expect(old.json.rows).toEqual([
      [0.1, 1],
      [1, 0.5],
    ]);
  });

  it("a datasetId from another manuscript is 404", async () => {
    const r = await upload(uploadForm("x.csv", "x,y\n1,2\n", { datasetId: "nope" }));
    expect(r.status).toBe(404);
  });

  it("bad files are refused with file, line and column, and leave nothing behind", async () => {
    const before = (await getDb().select().from(versions)).length;
    const ragged = await upload(uploadForm("ragged.csv", "a,b\n1,2\n3,4,5\n"));
    expect(ragged.status).toBe(422);
    expect(ragged.json.error.message).toMatch(/ragged\.csv, line 3/);
    const nonNumeric = await upload(uploadForm("n.csv", "a,b\n1,2\n3,2x\n5,6\n7,8\n"));
    expect(nonNumeric.status).toBe(422);
    expect(nonNumeric.json.error.message).toMatch(/line 3, column 2/);
    const binary = await upload(uploadForm("fake.csv", new Uint8Array([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0, 0, 0, 0, 0])));
    expect(binary.status).toBe(415);
    const empty = await upload(uploadForm("empty.csv", ""));
    expect(empty.status).toBe(422);
    const badJson = await upload(uploadForm("b.json", '{"columns": ["a"], "rows": [[1],'));
    expect(badJson.status).toBe(400);
    const badMeta = await upload(uploadForm("m.csv", "a\n1\n", { metadata: "{kind: 1" }));
    expect(badMeta.status).toBe(400);
    expect(badMeta.json.error.message).toMatch(/^metadata: not valid JSON/);
    const badKind = await upload(uploadForm("m.csv", "a\n1\n", { metadata: JSON.stringify({ kind: "xray" }) }));
    expect(badKind.status).toBe(400);
    expect(badKind.json.error.message).toMatch(/kind must be one of/);
    expect((await getDb().select().from(versions)).length).toBe(before);
    expect(fs.readdirSync(path.join(dir, "uploads", "tmp"))).toEqual([]);
  });

  it("413 past the size limit, checked while streaming; 415 for a non-multipart body", async () => {
    const big = "x,y\n" + "1.000000,2.000000\n".repeat(70_000);
    const r = await upload(uploadForm("big.csv", big));
    expect(r.status).toBe(413);
    expect(fs.readdirSync(path.join(dir, "uploads", "tmp"))).toEqual([]);
    const json = await call(list.POST, { method: "POST", token: tokens.author, params, body: { file: "x" } });
    expect(json.status).toBe(415);
    const nofile = await call(list.POST, {
      method: "POST",
      token: tokens.author,
      params,
      rawBody: (() => {
        const f = new FormData();
        f.set("name", "x");
        return f;
      })(),
    });
    expect(nofile.status).toBe(400);
  });

  it("viewers and reviewers cannot upload; outsiders get 404", async () => {
    expect((await upload(uploadForm("v.csv", "a\n1\n"), "viewer")).status).toBe(403);
    expect((await upload(uploadForm("v.csv", "a\n1\n"), "reviewer")).status).toBe(403);
    expect((await upload(uploadForm("v.csv", "a\n1\n"), "outsider")).status).toBe(404);
  });
});

describe("reading", () => {
  it("pages rows, summarises columns, plots two columns", async () => {
    const lines = ["f (MHz),pl"];
    for (let i = 0; i < 5000; i++) lines.push(`${2800 + i * 0.02},${i === 2500 ? 0.5 : 1 + (i % 7) * 1e-3}`);
    const v = await upload(uploadForm("odmr.csv", lines.join("\n")));
    const page = await call(rows.GET, { token: tokens.viewer, params: { id: v.json.id }, path: "/x?offset=4990&limit=100" });
    expect(page.json).toMatchObject({ offset: 4990, rowCount: 5000, names: ["f", "pl"] });
    expect(page.json.rows).toHaveLength(10);
    const meta = await call(version.GET, { token: tokens.viewer, params: { id: v.json.id } });
    expect(meta.json.summary[0]).toMatchObject({ column: "f", unit: "MHz", count: 5000, missing: 0, min: 2800 });
    const p = await call(plot.GET, { token: tokens.viewer, params: { id: v.json.id }, path: "/x?x=f&y=pl&points=200" });
    expect(p.json.downsampled).toBe(true);
    expect(p.json.points.x.length).toBeLessThanOrEqual(200);
    expect(Math.min(...p.json.points.y)).toBe(0.5);
    const bad = await call(plot.GET, { token: tokens.viewer, params: { id: v.json.id }, path: "/x?x=f&y=nope" });
    expect(bad.status).toBe(400);
    expect(bad.json.error.message).toMatch(/no column named "nope"/);
    const badPage = await call(rows.GET, { token: tokens.viewer, params: { id: v.json.id }, path: "/x?offset=-1" });
    expect(badPage.status).toBe(400);
  });

  it("editing metadata is audited and makes no new version", async () => {
    const v = await upload(uploadForm("meta.csv", "a\n1\n"));
    const r = await call(dataset.PATCH, {
      method: "PATCH",
      token: tokens.author,
      params: { id: v.json.datasetId },
      body: { sample: "K17-b", tags: { group: "oxygen-terminated" } },
    });
    expect(r.status).toBe(200);
    expect(r.json.versions).toHaveLength(1);
    const [row] = await getDb().select().from(datasets).where(eq(datasets.id, v.json.datasetId));
    expect(row!.tags).toEqual({ group: "oxygen-terminated" });
    const audit = await getDb().select().from(auditLog).where(eq(auditLog.action, "dataset.metadata"));
    expect(JSON.parse(audit.at(-1)!.data)).toMatchObject({ sample: { from: null, to: "K17-b" } });
    const viewer = await call(dataset.PATCH, { method: "PATCH", token: tokens.viewer, params: { id: v.json.datasetId }, body: { sample: "x" } });
    expect(viewer.status).toBe(403);
    const unknown = await call(dataset.PATCH, { method: "PATCH", token: tokens.author, params: { id: v.json.datasetId }, body: { colour: "red" } });
    expect(unknown.status).toBe(400);
  });
});
