// kill -9 during an upload, a batch of fits and a bundle export, and a fit run recorded with its derived version: the process storing a 1,000,000-row file is killed as soon as its
// temporary part file appears. Afterwards no version of it exists, the audit chain is whole, and
// the start-up sweeps (part files, then stored files nothing references) leave nothing behind.
// The file's SHA-256 is computed here with node:crypto.
import { spawn } from "node:child_process";
import { createHash } from "node:crypto";
import { once } from "node:events";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq, inArray } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { analyses, auditLog, datasets, versions } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { env } from "@/lib/env";
import { verifyAuditChain } from "@/lib/server/audit";
import { sweepUploadTemp } from "@/lib/server/storage";
import { sweepOrphanBlobs } from "@/lib/server/storage/orphan-sweep";
import { blobStore } from "@/lib/server/storage/store";
import { setupTestApp } from "./harness";

let file: string;
let sha: string;

beforeAll(async () => {
  await setupTestApp();
  const rows = ["t (µs),signal,sigma"];
  for (let i = 0; i < 1_000_000; i++) rows.push(`${i * 0.001},${(0.5 + 0.3 * Math.exp(-i / 300_000)).toFixed(6)},0.01`);
  const text = `${rows.join("\n")}\n`;
  file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-crash-")), "sweep.csv");
  fs.writeFileSync(file, text);
  sha = createHash("sha256").update(text).digest("hex");
}, 60_000);

describe("kill -9 during an upload", () => {
  it("leaves no version, a whole audit chain, and nothing after the sweeps", async () => {
    const versionsBefore = (await getDb().select().from(versions)).length;
    const tmp = path.join(env().uploadsDir, "tmp");
    const partAppeared = partFileAppears(tmp);
    // Its own process group, so the kill takes tsx and the ingest child with it.
    const child = spawn(path.join("node_modules", ".bin", "tsx"), ["--conditions=react-server", "tests/support/upload-child.ts", file, DEMO_MANUSCRIPT_ID], {
      cwd: process.cwd(),
      env: process.env,
      detached: true,
      stdio: ["ignore", "pipe", "pipe"],
    });
    let stdout = "";
    child.stdout!.on("data", (d: Buffer) => (stdout += d.toString("utf8")));
    const exited = once(child, "exit");
    await partAppeared;
    process.kill(-child.pid!, "SIGKILL");
    const [code, signal] = (await exited) as [number | null, NodeJS.Signals | null];
    expect(signal ?? code).toBe("SIGKILL");
    expect(stdout).not.toContain("stored");

    expect((await getDb().select().from(versions)).length).toBe(versionsBefore);
    expect(await getDb().select().from(datasets).where(eq(datasets.name, "Killed upload"))).toEqual([]);
    expect((await verifyAuditChain(getDb())).ok).toBe(true);

    // The killed process left its part file behind; the start-up sweep takes it.
    expect(fs.readdirSync(tmp).filter((n) => n.endsWith(".part")).length).toBeGreaterThan(0);
    await sweepUploadTemp(0);
    expect(fs.readdirSync(tmp).filter((n) => n.endsWith(".part"))).toEqual([]);
    const orphans = await sweepOrphanBlobs({ graceMs: 0 });
    expect(orphans.removed.every((r) => r.sha256 === sha)).toBe(true);
    expect(await blobStore().exists(sha)).toBe(false);
  }, 120_000);

  it("a fit run's derived version commits with the run or not at all", async () => {
    const { importDatasetFromBytes } = await import("@/lib/server/datasets/upload-dataset");
    const author = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };
    const before = (await getDb().select().from(versions)).length;
    const refused = importDatasetFromBytes(
      author,
      DEMO_MANUSCRIPT_ID,
      "fit-derived.csv",
      new TextEncoder().encode("t,y\n1,2\n2,3\n"),
      { name: "Derived, run fails" },
      async () => {
        throw new Error("the run's record could not be written");
      },
    );
    await expect(refused).rejects.toThrow("the run's record could not be written");
    expect((await getDb().select().from(versions)).length).toBe(before);
    expect(await getDb().select().from(datasets).where(eq(datasets.name, "Derived, run fails"))).toEqual([]);
    expect((await verifyAuditChain(getDb())).ok).toBe(true);
  });

  it("kill -9 after the first fit of a batch: every stored run is whole, no derived version without its run", async () => {
    const { importDatasetFromBytes } = await import("@/lib/server/datasets/upload-dataset");
    const author = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };
    const ids: string[] = [];
    for (const t1 of [2, 4, 8, 16, 32, 64, 128, 256]) {
      const csv = `wait (ms),p\n${Array.from({ length: 30 }, (_, i) => `${0.05 * 1.25 ** i},${(0.7 + 0.3 * Math.exp(-(0.05 * 1.25 ** i) / t1) + 0.002 * Math.sin(7 * i)).toFixed(5)}`).join("\n")}\n`;
      ids.push((await importDatasetFromBytes(author, DEMO_MANUSCRIPT_ID, `t1-${t1}.csv`, new TextEncoder().encode(csv), { name: `Batch crash T1 ${t1}` })).id);
    }
    const child = spawn(path.join("node_modules", ".bin", "tsx"), ["--conditions=react-server", "tests/support/batch-child.ts", DEMO_MANUSCRIPT_ID, ...ids], {
      cwd: process.cwd(),
      env: { ...process.env, FIT_WORKERS: "1" },
      detached: true,
      stdio: ["ignore", "pipe", "pipe"],
    });
    const exited = once(child, "exit");
    let seen = "";
    await new Promise<void>((resolve) => {
      child.stdout!.on("data", (d: Buffer) => {
        seen += d.toString("utf8");
        if (seen.includes('"result"')) resolve();
      });
    });
    process.kill(-child.pid!, "SIGKILL");
    await exited;
    expect(seen).not.toContain('"end"');

    const runs = await getDb().select().from(analyses).where(inArray(analyses.versionId, ids));
    expect(runs.length).toBeGreaterThanOrEqual(1);
    expect(runs.length).toBeLessThan(ids.length);
    for (const run of runs) {
      const [derived] = await getDb().select().from(versions).where(eq(versions.id, run.derivedVersionId!));
      expect(derived?.derivedFromAnalysisId).toBe(run.id);
    }
    // Derived versions of these inputs: each one belongs to a stored run.
    const derivedSets = await getDb().select().from(datasets).where(eq(datasets.manuscriptId, DEMO_MANUSCRIPT_ID));
    const fromThese = derivedSets.filter((d) => d.name.startsWith("Batch crash T1") && d.tags.derivedFrom);
    for (const d of fromThese) {
      for (const v of await getDb().select().from(versions).where(eq(versions.datasetId, d.id))) expect(v.derivedFromAnalysisId).not.toBeNull();
    }
    expect((await verifyAuditChain(getDb())).ok).toBe(true);
    // A derived file the kill caught half-written is a part file, which the start-up sweep takes.
    const tmp = path.join(env().uploadsDir, "tmp");
    await sweepUploadTemp(0);
    expect(fs.existsSync(tmp) ? fs.readdirSync(tmp).filter((n) => n.endsWith(".part")) : []).toEqual([]);
  }, 120_000);
});

/** Every file under dir, relative, sorted (the database's own files left out: they change with every write). */
/** Resolves when a part file (an upload or an export being written) appears in `tmp`. */
function partFileAppears(tmp: string): Promise<void> {
  fs.mkdirSync(tmp, { recursive: true });
  return new Promise<void>((resolve) => {
    const watcher = fs.watch(tmp, (_event, name) => {
      if (!name?.endsWith(".part")) return;
      watcher.close();
      resolve();
    });
  });
}

function filesUnder(dir: string): string[] {
  if (!fs.existsSync(dir)) return [];
  return (fs.readdirSync(dir, { recursive: true, withFileTypes: true }) as fs.Dirent[])
    .filter((e) => e.isFile() && !/\.(db|db-wal|db-shm|sqlite)$/.test(e.name))
    .map((e) => path.relative(dir, path.join(e.parentPath, e.name)))
    .sort();
}

describe("kill -9 during a bundle export", () => {
  it("leaves no export record and no file; the next export is whole", async () => {
    const { importDatasetFromBytes } = await import("@/lib/server/datasets/upload-dataset");
    const { createFigure } = await import("@/lib/server/figures/figures");
    const { addPanel } = await import("@/lib/server/figures/panels");
    const { createRevision } = await import("@/lib/server/figures/revisions");
    const { exportFigure } = await import("@/lib/server/export/export-figure");
    const author = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };
    const pi = { id: "demo-pi", email: "pi@lab.example.org", name: "Mira Halvorsen" };
    const rows = ["tau,signal"];
    for (let i = 0; i < 200_000; i++) rows.push(`${i * 0.01},${(0.5 + 0.3 * Math.exp(-i / 60_000) + 0.01 * Math.sin(i)).toFixed(6)}`);
    const version = await importDatasetFromBytes(author, DEMO_MANUSCRIPT_ID, "export-crash.csv", new TextEncoder().encode(`${rows.join("\n")}\n`), {
      name: "Export crash sweep",
    });
    const figure = await createFigure(author, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Killed export" });
    const panel = await addPanel(author, figure.id, { title: "Sweep" });
    await createRevision(author, panel.id, {
      spec: {
        $schema: "https://vega.github.io/schema/vega-lite/v6.json",
        data: { name: "sweep" },
        mark: "point",
        encoding: { x: { field: "tau", type: "quantitative", title: "τ (µs)" }, y: { field: "signal", type: "quantitative", title: "signal (1)" } },
      },
      bindings: { sweep: { versionId: version.id } },
      baseRevisionId: null,
      message: "",
    });
    const exportsOf = async () =>
      (
        await getDb()
          .select()
          .from(auditLog)
          .where(eq(auditLog.target, `figure:${figure.id}`))
      ).filter((a) => a.action === "figure.export");
    const filesBefore = filesUnder(env().uploadsDir);
    // The bundle is written to a part file as it is made: killed while that file is being written.
    const tmp = path.join(env().uploadsDir, "tmp");
    const partAppeared = partFileAppears(tmp);

    const child = spawn(path.join("node_modules", ".bin", "tsx"), ["--conditions=react-server", "tests/support/export-child.ts", figure.id], {
      cwd: process.cwd(),
      env: process.env,
      detached: true,
      stdio: ["ignore", "pipe", "pipe"],
    });
    const exited = once(child, "exit");
    let seen = "";
    child.stdout!.on("data", (d: Buffer) => (seen += d.toString("utf8")));
    await partAppeared;
    process.kill(-child.pid!, "SIGKILL");
    await exited;
    expect(seen).toContain("exporting");
    expect(seen).not.toContain("exported");

    expect(await exportsOf()).toEqual([]);
    expect((await verifyAuditChain(getDb())).ok).toBe(true);
    // The half-written bundle is left as a part file, which the start-up sweep takes: then nothing is left.
    expect(fs.readdirSync(tmp).filter((n) => n.endsWith(".part")).length).toBeGreaterThan(0);
    await sweepUploadTemp(0);
    expect(filesUnder(env().uploadsDir)).toEqual(filesBefore);

    const { body } = await exportFigure(pi, figure.id, { format: "bundle", dpi: 300, colour: "rgb", text: "outlines", mark: "on" });
    expect((await body.bytes()).byteLength).toBe(body.byteLength);
    expect(body.byteLength).toBeGreaterThan(0);
    expect(await exportsOf()).toHaveLength(1);
    expect((await verifyAuditChain(getDb())).ok).toBe(true);
  }, 180_000);
});
