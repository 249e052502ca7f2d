/**
 * Submission exports at growing data size, in this process with the ordinary services (as the
 * server runs them) on a throw-away database with the demo seed:
 *
 * - the demo figure (Figure 1 of the demo manuscript);
 * - a one-panel figure bound to a version of N rows × 3 columns (N = 10,000, 100,000, 1,000,000),
 *   drawn as points.
 *
 * For each: the xlsx source data and the reproducibility bundle (time, bytes, and the peak resident
 * memory this process adds: VmHWM reset just before each export through /proc/self/clear_refs, minus
 * the VmRSS right before), then `verifyBundle` on the bundle (time and whether all rows match).
 * The render worker and the ingest child are processes of their own and not counted here.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { statusKb } from "./proc-stats";
import { round } from "./report";

const SIZES = [10_000, 100_000, 1_000_000];
const VL = "https://vega.github.io/schema/vega-lite/v6.json";

function csv(rows: number): Uint8Array {
  const lines = ["t (µs),signal,sigma"];
  for (let i = 0; i < rows; i++) {
    const t = (300 * i) / rows;
    lines.push(`${t.toFixed(6)},${(0.5 + 0.3 * Math.exp(-((t / 80) ** 2)) + 0.01 * Math.sin(i)).toFixed(6)},0.01`);
  }
  return new TextEncoder().encode(`${lines.join("\n")}\n`);
}

/** Runs fn with this process's peak-RSS mark reset; returns its result, ms and the MB it added at peak. */
async function measured<T>(fn: () => Promise<T>): Promise<{ value: T; ms: number; peakAddedMb: number }> {
  (globalThis as { gc?: () => void }).gc?.();
  fs.writeFileSync("/proc/self/clear_refs", "5");
  const before = statusKb(process.pid, "VmRSS") ?? 0;
  const t0 = performance.now();
  const value = await fn();
  const ms = performance.now() - t0;
  const peak = statusKb(process.pid, "VmHWM") ?? 0;
  return { value, ms, peakAddedMb: round(Math.max(0, peak - before) / 1024, 1) };
}

export async function benchExport(): Promise<Record<string, unknown>> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-bench-export-"));
  Object.assign(process.env, {
    DATABASE_URL: `file:${path.join(dir, "bench.db")}`,
    UPLOADS_DIR: path.join(dir, "uploads"),
    MAIL_SINK_DIR: path.join(dir, "mail"),
    AUTH_SECRET: "bench-secret-bench-secret-bench-secret-01",
    UPLOAD_MAX_BYTES: String(512 * 1024 ** 2),
  });
  (await import("@/lib/env")).resetEnvForTests();
  const { closeDb, getDb } = await import("@/db/client");
  closeDb();
  await (await import("@/db/migrate")).applyMigrations();
  await (await import("@/lib/server/demo/seed-demo")).seedDemoWithData();
  const { DEMO_ACCOUNTS, DEMO_MANUSCRIPT_ID } = await import("@/lib/demo-data/accounts");
  const { figures } = await import("@/db/schema");
  const { eq } = await import("drizzle-orm");
  const { exportFigure } = await import("@/lib/server/export/export-figure");
  const { verifyBundle } = await import("@/lib/server/export/verify-bundle");
  const { importDatasetFromBytes } = await import("@/lib/server/datasets/upload-dataset");
  const { createFigure } = await import("@/lib/server/figures/figures");
  const { addPanel } = await import("@/lib/server/figures/panels");
  const { createRevision } = await import("@/lib/server/figures/revisions");
  const { stopRenderWorkers } = await import("@/lib/server/render/render-in-worker");
  const a = DEMO_ACCOUNTS.find((x) => x.email.startsWith("author@"))!;
  const author = { id: a.id, email: a.email, name: a.name };

  const cases: Array<{ name: string; rows: number | string; figureId: string }> = [];
  const [demo] = await getDb().select({ id: figures.id }).from(figures).where(eq(figures.manuscriptId, DEMO_MANUSCRIPT_ID)).orderBy(figures.number).limit(1);
  cases.push({ name: "demo figure", rows: "demo", figureId: demo.id });
  for (const rows of SIZES) {
    const version = await importDatasetFromBytes(author, DEMO_MANUSCRIPT_ID, `sweep-${rows}.csv`, csv(rows), { name: `Sweep of ${rows} rows` });
    const figure = await createFigure(author, { manuscriptId: DEMO_MANUSCRIPT_ID, title: `Sweep of ${rows} rows`, widthMm: 89, columns: 1 });
    const panel = await addPanel(author, figure.id, {});
    await createRevision(author, panel.id, {
      spec: {
        $schema: VL,
        width: 200,
        height: 140,
        data: { name: "sweep" },
        mark: "point",
        encoding: { x: { field: "t", type: "quantitative" }, y: { field: "signal", type: "quantitative" } },
      },
      bindings: { sweep: { versionId: version.id } },
      baseRevisionId: null,
      message: "",
    });
    cases.push({ name: `${rows.toLocaleString("en")} rows`, rows, figureId: figure.id });
  }

  const out: Array<Record<string, unknown>> = [];
  for (const c of cases) {
    console.log(`   ${c.name}…`);
    const xlsx = await measured(() => exportFigure(author, c.figureId, { format: "xlsx" } as never));
    const bundle = await measured(() => exportFigure(author, c.figureId, { format: "bundle" } as never));
    await xlsx.value.body.bytes();
    const bytes = await bundle.value.body.bytes();
    const verify = await measured(() => verifyBundle(bytes));
    out.push({
      figure: c.name,
      xlsxMs: round(xlsx.ms),
      xlsxMb: round(xlsx.value.body.byteLength / 1024 ** 2, 2),
      xlsxPeakAddedMb: xlsx.peakAddedMb,
      bundleMs: round(bundle.ms),
      bundleMb: round(bytes.byteLength / 1024 ** 2, 2),
      bundlePeakAddedMb: bundle.peakAddedMb,
      verifyMs: round(verify.ms),
      verifyPeakAddedMb: verify.peakAddedMb,
      verified: verify.value.ok,
    });
  }
  await stopRenderWorkers();
  console.table(out);
  fs.rmSync(dir, { recursive: true, force: true });
  return { cases: out, note: "peak MB added by this process (the server's work); render worker and ingest child not counted" };
}
