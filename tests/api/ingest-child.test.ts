// Uploads are parsed in the budgeted ingest child: its refusals reach the client as exact 4xx
// answers and leave nothing stored; what it writes (the columnar cache) is complete or absent.
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { datasets, versions } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { resetEnvForTests } from "@/lib/env";
import * as list from "@/app/api/manuscripts/[id]/datasets/route";
import * as rows from "@/app/api/versions/[id]/rows/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let dir: string;
beforeAll(async () => {
  process.env.UPLOAD_MAX_BYTES = String(32 * 1024 * 1024);
  ({ tokens, dir } = await setupTestApp());
});

const params = { id: DEMO_MANUSCRIPT_ID };
const upload = (fileName: string, content: string, fields: Record<string, string> = {}) =>
  call(list.POST, { method: "POST", token: tokens.author, params, rawBody: uploadForm(fileName, content, fields) });

const sha256 = (s: string) => createHash("sha256").update(s).digest("hex");

/** Every file under uploads/, relative. */
function storedFiles(): string[] {
  const root = path.join(dir, "uploads");
  if (!fs.existsSync(root)) return [];
  return fs.readdirSync(root, { recursive: true, encoding: "utf8" }).filter((f) => fs.statSync(path.join(root, f)).isFile());
}

async function rowCounts() {
  return { datasets: (await getDb().select().from(datasets)).length, versions: (await getDb().select().from(versions)).length };
}

/** Runs `fn` with environment variables set, then puts the environment back. */
async function withEnv<T>(vars: Record<string, string>, fn: () => Promise<T>): Promise<T> {
  Object.assign(process.env, vars);
  resetEnvForTests();
  try {
    return await fn();
  } finally {
    for (const k of Object.keys(vars)) delete process.env[k];
    resetEnvForTests();
  }
}

/** A numeric column and a text column of distinct labels: the labels live on the child's heap. */
function labelled(rowCount: number): string {
  const lines = ["t (µs),label"];
  for (let i = 0; i < rowCount; i++) lines.push(`${i},run-${i}`);
  return `${lines.join("\n")}\n`;
}

describe("ingest child", () => {
  it("a parse that fails in the child is a 422 with file, line and column, and leaves no version and no file behind", async () => {
    const filesBefore = storedFiles();
    const countsBefore = await rowCounts();
    // 50,000 good rows, then a bad cell: the child reads well into the file before it stops.
    const good = Array.from({ length: 50_000 }, (_, i) => `${i},${i * 0.5}`).join("\n");
    const content = `tau (µs),signal\n${good}\n50000,0.5x\n50001,7\n`;
    const r = await upload("deep.csv", content, { name: "Deep" });
    expect(r.status).toBe(422);
    expect(r.json.error.message).toMatch(/^deep\.csv, line 50002, column 2 \("signal"\): "0\.5x" is not a number/);

    const sha = sha256(content);
    expect(fs.existsSync(path.join(dir, "uploads", sha.slice(0, 2), sha.slice(2, 4), sha))).toBe(false);
    expect(fs.existsSync(path.join(dir, "uploads", "cache", `${sha}.columns`))).toBe(false);
    expect(storedFiles()).toEqual(filesBefore);
    expect(await rowCounts()).toEqual(countsBefore);

    // The same child takes the next file.
    const ok = await upload("fine.csv", "tau (µs),signal\n1,0.9\n2,0.8\n");
    expect(ok.status).toBe(201);
    expect(ok.json.rowCount).toBe(2);
  });

  it("a file that needs more memory than the child's budget is a 413 that names the budget; nothing is stored and the next upload works", async () => {
    const big = labelled(1_000_000);
    await withEnv({ INGEST_HEAP_MB: "16" }, async () => {
      // The child starts and works within the budget …
      const small = await upload("small.csv", labelled(10));
      expect(small.status).toBe(201);

      // … but this file's labels do not fit in it.
      const filesBefore = storedFiles();
      const countsBefore = await rowCounts();
      const r = await upload("labels.csv", big, { name: "Labels" });
      expect(r.status).toBe(413);
      expect(r.json.error.code).toBe("ingest_memory_budget");
      expect(r.json.error.message).toBe(
        "labels.csv: reading this file needs more memory than one upload may use (16 MB). Split it into smaller files, or ask the administrator to raise INGEST_HEAP_MB.",
      );
      expect(storedFiles()).toEqual(filesBefore);
      expect(await rowCounts()).toEqual(countsBefore);
    });

    // With the default budget the same file is stored.
    const r = await upload("labels.csv", big, { name: "Labels" });
    expect(r.status).toBe(201);
    expect(r.json.rowCount).toBe(1_000_000);
    expect(r.json.columns.map((c: { name: string; type: string }) => `${c.name}:${c.type}`)).toEqual(["t:number", "label:string"]);
  });

  it("a missing columnar cache is rebuilt by the child from the stored file", async () => {
    const content = "f (MHz),counts\n2870,1000\n2871,990\n2872,1010\n";
    const up = await upload("odmr.csv", content);
    expect(up.status).toBe(201);
    const cache = path.join(dir, "uploads", "cache", `${up.json.sha256}.columns`);
    expect(fs.existsSync(cache)).toBe(true);
    fs.rmSync(cache);

    const page = await call(rows.GET, { token: tokens.author, params: { id: up.json.id }, path: `/api/versions/${up.json.id}/rows?offset=1&limit=2` });
    expect(page.status).toBe(200);
    expect(page.json.rows).toEqual([
      [2871, 990],
      [2872, 1010],
    ]);
    expect(fs.existsSync(cache)).toBe(true);
    expect(fs.readdirSync(path.join(dir, "uploads", "tmp"))).toEqual([]);
  });
});
