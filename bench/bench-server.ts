/**
 * A production server for the HTTP benchmarks: `next start` on a throw-away database (migrated and
 * seeded with the demo lab) with its own uploads and mail directories and ports, API tokens for
 * demo accounts, and the mail sink in a process of its own, as a relay would be: parsing and storing
 * the server's mail in the load generator's process held up every request it was timing.
 *
 * - The build is made only when the sources are newer than .next, under the build lock
 *   (`flock /tmp/prooflight-build.lock next build`), after waiting for others' builds and servers.
 * - While the server runs, a shared lock on the build lock file keeps a concurrent `next build`
 *   from rewriting .next under it.
 * - process.env points at the throw-away database until stop(), so the bench process can open it
 *   with the ordinary services (getDb()) beside the server; stop() restores it.
 * - stop() ends the process group it started (SIGTERM, then SIGKILL), releases the lock, closes
 *   the sink and removes the directory; Ctrl+C does the same through spawnNext's handlers.
 */
import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { findServerPid, foreignNext, type ServerProcess } from "./proc-stats";

export const BUILD_LOCK = "/tmp/prooflight-build.lock";

export type BuildOutcome = "fresh" | "built" | "stale (another server was using .next)";

export function portOpen(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect({ port, host: "127.0.0.1" }, () => {
      s.destroy();
      resolve(true);
    });
    s.on("error", () => resolve(false));
  });
}

function waitForExit(child: ChildProcess, timeoutMs: number): Promise<boolean> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve(true);
  return new Promise((resolve) => {
    const timer = setTimeout(() => resolve(false), timeoutMs);
    child.once("exit", () => {
      clearTimeout(timer);
      resolve(true);
    });
  });
}

/** SIGTERM to the process group we started, SIGKILL if it is still there after `graceMs`. */
export async function stopGroup(child: ChildProcess, graceMs = 10_000): Promise<void> {
  if (!child.pid) return;
  try {
    process.kill(-child.pid, "SIGTERM");
  } catch {
    return;
  }
  if (!(await waitForExit(child, graceMs))) {
    try {
      process.kill(-child.pid, "SIGKILL");
    } catch {
      /* gone */
    }
    await waitForExit(child, 2_000);
  }
}

/** The mail sink (scripts/mail-sink.ts) in its own process group, once it listens. */
async function startSinkProcess(port: number, env: Record<string, string>): Promise<ChildProcess> {
  const child = spawn(path.join("node_modules", ".bin", "tsx"), ["--conditions=react-server", "scripts/mail-sink.ts"], {
    env: { ...process.env, ...env },
    stdio: ["ignore", "ignore", "inherit"],
    detached: true,
  });
  // Also when the bench is stopped with Ctrl+C.
  process.once("exit", () => {
    try {
      process.kill(-child.pid!, "SIGKILL");
    } catch {
      /* gone */
    }
  });
  const until = Date.now() + 30_000;
  while (!(await portOpen(port))) {
    if (child.exitCode !== null || Date.now() > until) {
      await stopGroup(child, 1_000);
      throw new Error(`the mail sink did not start on port ${port}`);
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  return child;
}

async function waitWhile(what: string, busy: () => boolean, timeoutMs: number): Promise<boolean> {
  if (!busy()) return true;
  console.log(`  waiting for ${what} …`);
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    await new Promise((r) => setTimeout(r, 2_000));
    if (!busy()) return true;
  }
  return false;
}

/**
 * `next build` under the build lock, only when the sources are newer than .next. Waits for a build
 * someone else started (it may make ours unnecessary) and does not rewrite .next under a server
 * someone else runs from it: after 5 minutes the existing build is benchmarked, and says so.
 */
export async function buildIfStale(): Promise<BuildOutcome> {
  const { buildIsStale } = await import("../scripts/lib/processes");
  if (!buildIsStale()) return "fresh";
  await waitWhile("another next build in this tree", () => foreignNext("next-build").length > 0, 15 * 60_000);
  if (!buildIsStale()) return "fresh";
  const free = await waitWhile("another next server running from this .next", () => foreignNext("next-server").length > 0, 5 * 60_000);
  if (!free && fs.existsSync(path.join(process.cwd(), ".next", "BUILD_ID"))) {
    console.warn("  note: the build is stale, but another server still runs from .next; benchmarking the existing build.");
    return "stale (another server was using .next)";
  }
  const log = path.join(os.tmpdir(), "prooflight-bench-build.log");
  console.log(`  build is stale: flock ${BUILD_LOCK} next build (log: ${log}) …`);
  const out = fs.openSync(log, "w");
  const child = spawn("flock", [BUILD_LOCK, process.execPath, "node_modules/next/dist/bin/next", "build"], {
    stdio: ["ignore", out, out],
    env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
  });
  const code = await new Promise<number | null>((resolve) => child.once("exit", (c) => resolve(c)));
  fs.closeSync(out);
  if (code !== 0) {
    console.error(fs.readFileSync(log, "utf8").split("\n").slice(-40).join("\n"));
    throw new Error(`next build failed (exit ${code}); see ${log}`);
  }
  if (buildIsStale()) console.warn("  note: sources changed again during the build; benchmarking the build just made.");
  return "built";
}

/**
 * Holds a shared lock on the build lock file until released. The holder waits on a pipe from this
 * process, so it lets go even if the bench dies without cleaning up.
 */
async function holdBuildLockShared(): Promise<ChildProcess> {
  const child = spawn("flock", ["-s", BUILD_LOCK, "-c", "echo locked; exec cat >/dev/null"], { detached: true, stdio: ["pipe", "pipe", "inherit"] });
  await new Promise<void>((resolve, reject) => {
    child.stdout!.once("data", () => resolve());
    child.once("exit", (code) => reject(new Error(`flock -s exited with ${code}`)));
  });
  return child;
}

export interface BenchServerOptions {
  appPort: number;
  smtpPort: number;
  /** E-mails of seeded accounts that get a personal API token (named after `tokenName`). */
  tokensFor?: string[];
  tokenName?: string;
}

export interface BenchServer {
  base: string;
  /** The throw-away directory: database, uploads, mail; the bench may put its own files here. */
  dir: string;
  /** API token per e-mail of `tokensFor`. */
  tokens: Record<string, string>;
  /** The next-server process (for /proc readings) and the group leader started by spawnNext. */
  server: ServerProcess;
  groupPid: number;
  build: BuildOutcome;
  readyMs: number;
  stop(): Promise<void>;
}

/** Starts the server; on failure everything begun so far is undone before the error is thrown. */
export async function startBenchServer(opts: BenchServerOptions): Promise<BenchServer> {
  const base = `http://localhost:${opts.appPort}`;
  for (const port of [opts.appPort, opts.smtpPort])
    if (await portOpen(port)) throw new Error(`port ${port} is already in use; stop whatever listens there first.`);

  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-bench-"));
  const removeDir = () => fs.rmSync(dir, { recursive: true, force: true });
  process.once("exit", removeDir); // also after Ctrl+C (spawnNext exits the process then)
  const benchEnv = {
    PORT: String(opts.appPort),
    APP_URL: base,
    DATABASE_URL: `file:${path.join(dir, "bench.db")}`,
    UPLOADS_DIR: path.join(dir, "uploads"),
    MAIL_SINK_DIR: path.join(dir, "mail"),
    SMTP_PORT: String(opts.smtpPort),
    // Load generators post and upload far faster than people; the limits are tested in tests/api.
    COMMENTS_PER_MINUTE: "1000000",
    UPLOADS_PER_USER: "64",
    UPLOADS_IN_TOTAL: "64",
  };
  const savedEnv = Object.fromEntries(Object.keys(benchEnv).map((k) => [k, process.env[k]]));
  let server: ChildProcess | undefined;
  let lock: ChildProcess | undefined;
  let sink: ChildProcess | undefined;
  let stopped = false;
  const stop = async () => {
    if (stopped) return;
    stopped = true;
    if (server) await stopGroup(server);
    if (lock) {
      lock.stdin!.end();
      await stopGroup(lock, 2_000);
    }
    if (sink) await stopGroup(sink, 2_000);
    const { closeDb } = await import("@/db/client");
    closeDb();
    for (const [k, v] of Object.entries(savedEnv))
      if (v === undefined) delete process.env[k];
      else process.env[k] = v;
    (await import("@/lib/env")).resetEnvForTests();
    process.removeListener("exit", removeDir);
    removeDir();
  };

  try {
    const { ensureLocalEnv } = await import("../scripts/lib/local-env");
    ensureLocalEnv(); // AUTH_SECRET for the server
    Object.assign(process.env, benchEnv);
    const { resetEnvForTests } = await import("@/lib/env");
    const { closeDb } = await import("@/db/client");
    closeDb();
    resetEnvForTests();
    const { applyMigrations } = await import("@/db/migrate");
    const { seedDemoWithData } = await import("@/lib/server/demo/seed-demo");
    const { findUserByEmail } = await import("@/lib/server/users");
    const { createApiToken } = await import("@/lib/server/api-tokens");
    const { spawnNext, waitForHttp } = await import("../scripts/lib/processes");

    await applyMigrations();
    await seedDemoWithData();
    const tokens: Record<string, string> = {};
    for (const email of opts.tokensFor ?? []) {
      const user = await findUserByEmail(email);
      if (!user) throw new Error(`the demo seed has no ${email}`);
      tokens[email] = (await createApiToken({ id: user.id, email: user.email, name: user.name }, { name: opts.tokenName ?? "bench" })).token;
    }
    closeDb();

    const build = await buildIfStale();
    lock = await holdBuildLockShared();
    sink = await startSinkProcess(opts.smtpPort, benchEnv);
    // BENCH_SERVER_NODE_ARGS: flags for the server's node (e.g. "--cpu-prof --cpu-prof-dir=/tmp/prof" to profile it under load).
    server = spawnNext(["start", "-p", String(opts.appPort)], benchEnv, (process.env.BENCH_SERVER_NODE_ARGS ?? "").split(" ").filter(Boolean));
    const t0 = performance.now();
    await waitForHttp(`${base}/api/health`, 90_000);
    const readyMs = performance.now() - t0;
    return { base, dir, tokens, server: findServerPid(server.pid!), groupPid: server.pid!, build, readyMs, stop };
  } catch (err) {
    await stop();
    throw err;
  }
}

/** Runs `fn` against a fresh bench server and stops it afterwards, whatever happens. */
export async function withBenchServer<T>(opts: BenchServerOptions, fn: (srv: BenchServer) => Promise<T>): Promise<T> {
  const srv = await startBenchServer(opts);
  try {
    return await fn(srv);
  } finally {
    await srv.stop();
  }
}
