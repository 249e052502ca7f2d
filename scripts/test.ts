// `npm test`: every test — unit, reference, API on real SQLite files, then the browser tests in Chromium
// against `next start` on a freshly seeded database with the SMTP sink running.
import { spawn, spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { ensureLocalEnv } from "./lib/local-env";

ensureLocalEnv();
const root = process.cwd();
const work = path.join(root, ".test-work");
fs.rmSync(work, { recursive: true, force: true });
fs.mkdirSync(work, { recursive: true });

function run(cmd: string, args: string[], env: Record<string, string> = {}): number {
  const r = spawnSync(cmd, args, { stdio: "inherit", env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1", ...env } });
  return r.status ?? 1;
}

/** Asynchronous, so the mail sink living in this process keeps answering while the browser tests run. */
function runAsync(cmd: string, args: string[], env: Record<string, string> = {}): Promise<number> {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { stdio: "inherit", env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1", ...env } });
    child.on("exit", (code) => resolve(code ?? 1));
  });
}

/** The parts of Vitest's and Playwright's JSON reports read here. */
interface VitestReport {
  numPassedTests: number;
  numFailedTests: number;
  numFailedTestSuites?: number;
  numPendingTests: number;
  numTodoTests: number;
}
interface PlaywrightReport {
  stats: { expected: number; unexpected: number; flaky: number; skipped: number };
}

function counts(file: string, kind: "vitest" | "playwright"): { passed: number; failed: number; skipped: number } {
  if (!fs.existsSync(file)) return { passed: 0, failed: 1, skipped: 0 };
  const text = fs.readFileSync(file, "utf8");
  // A suite that fails to load has no failed tests of its own; count it only then.
  if (kind === "vitest") {
    const j = JSON.parse(text) as VitestReport;
    return { passed: j.numPassedTests, failed: j.numFailedTests || (j.numFailedTestSuites ?? 0), skipped: j.numPendingTests + j.numTodoTests };
  }
  const j = JSON.parse(text) as PlaywrightReport;
  return { passed: j.stats.expected, failed: j.stats.unexpected + j.stats.flaky, skipped: j.stats.skipped };
}

// `npm test -- --browser-only [playwright args]` runs the browser tests alone (while working on a page).
const browserOnly = process.argv.includes("--browser-only");
const playwrightArgs = process.argv.slice(2).filter((a) => a !== "--browser-only");
const vitestJson = path.join(work, "vitest.json");
const vitestCode = browserOnly
  ? 0
  : run(process.execPath, ["node_modules/vitest/vitest.mjs", "run", "--reporter=default", "--reporter=json", `--outputFile.json=${vitestJson}`]);
const total = browserOnly ? { passed: 0, failed: 0, skipped: 0 } : counts(vitestJson, "vitest");
let e2eCode = 0;
/** The two-instance check (tests/scale-out): it needs the production build, so it runs with the browser tests. */
let scaleOutCode = 0;

const chromium = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
if (!fs.existsSync(chromium)) {
  if (process.env.CI) {
    console.error(`\n✕ Chromium not found at ${chromium}; CI must install Debian's chromium (see .ci/run).`);
    e2eCode = 1;
  } else {
    console.warn(
      `\n!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!\n!! BROWSER TESTS SKIPPED: no Chromium at ${chromium}.\n!! Install it (apt-get install -y chromium) to run tests/e2e.\n!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!!\n`,
    );
  }
} else {
  e2eCode = await runBrowserTests();
  total[scaleOutCode === 0 ? "passed" : "failed"] += 1;
  const e2e = counts(path.join(work, "playwright.json"), "playwright");
  total.passed += e2e.passed;
  total.failed += e2e.failed;
  total.skipped += e2e.skipped;
}

async function runBrowserTests(): Promise<number> {
  const { buildIsStale, runNextSync, spawnNext, waitForHttp } = await import("./lib/processes");
  if (buildIsStale()) {
    console.log("\nBuilding the application for the browser tests…");
    await runNextSync(["build"]);
  }
  console.log("\nTwo instances on one database and one S3-compatible bucket…");
  scaleOutCode = run(path.join("node_modules", ".bin", "tsx"), ["--conditions=react-server", "tests/scale-out/two-instances.ts"]);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-e2e-"));
  const port = process.env.E2E_PORT ?? "3100";
  const env = {
    PORT: port,
    DATABASE_URL: `file:${path.join(dir, "e2e.db")}`,
    UPLOADS_DIR: path.join(dir, "uploads"),
    MAIL_SINK_DIR: path.join(dir, "mail"),
    SMTP_PORT: process.env.E2E_SMTP_PORT ?? "2626",
    APP_URL: `http://localhost:${port}`,
    PROOFLIGHT_INSTANCE: "demo",
    // The concurrency test posts 1,000 comments as one reviewer; the limit itself is tested in tests/api.
    COMMENTS_PER_MINUTE: "5000",
    // Notices to one person within 2 s become one mail (60 s in use), so the mail tests wait seconds.
    MAIL_COALESCE_SECONDS: "2",
  };
  Object.assign(process.env, env);
  const { applyMigrations } = await import("@/db/migrate");
  const { seedDemoWithData } = await import("@/lib/server/demo/seed-demo");
  const { closeDb } = await import("@/db/client");
  const { startMailSink } = await import("@/lib/server/mail/sink-server");
  await applyMigrations();
  await seedDemoWithData();
  closeDb();
  const sink = await startMailSink({ port: Number(env.SMTP_PORT), dir: env.MAIL_SINK_DIR, quiet: true });
  const server = spawnNext(["start", "-p", port], env);
  try {
    await waitForHttp(`http://localhost:${port}/api/health`, 90_000);
    return await runAsync(process.execPath, ["node_modules/@playwright/test/cli.js", "test", ...playwrightArgs], {
      ...env,
      BASE_URL: `http://localhost:${port}`,
    });
  } finally {
    if (server.pid)
      try {
        process.kill(-server.pid, "SIGTERM");
      } catch {
        /* gone */
      }
    await sink.close();
  }
}

console.log(`\nunit, reference, API and browser tests`);
console.log(`Total: ${total.passed} passed, ${total.failed} failed, ${total.skipped} skipped`);
process.exit(vitestCode !== 0 || e2eCode !== 0 || scaleOutCode !== 0 ? 1 : 0);
