import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const nextBin = () => path.join(process.cwd(), "node_modules", "next", "dist", "bin", "next");

/** Runs next in its own process group so that stopping it stops next-server too. */
export function spawnNext(args: string[], env: Record<string, string> = {}, nodeArgs: string[] = []): ChildProcess {
  const child = spawn(process.execPath, [...nodeArgs, nextBin(), ...args], {
    stdio: "inherit",
    detached: true,
    env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1", ...env },
  });
  const stop = () => {
    try {
      if (child.pid) process.kill(-child.pid, "SIGTERM");
    } catch {
      /* already gone */
    }
  };
  process.once("exit", stop);
  for (const sig of ["SIGINT", "SIGTERM"] as const)
    process.once(sig, () => {
      stop();
      process.exit(0);
    });
  return child;
}

export function runNextSync(args: string[]): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [nextBin(), ...args], { stdio: "inherit", env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" } });
    child.on("exit", (code) => (code === 0 ? resolve() : reject(new Error(`next ${args.join(" ")} exited with ${code}`))));
  });
}

function newestMtime(dir: string): number {
  let newest = 0;
  if (!fs.existsSync(dir)) return 0;
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(p) : fs.statSync(p).mtimeMs);
  }
  return newest;
}

/** True when there is no production build, or a source file changed after it. */
export function buildIsStale(root = process.cwd()): boolean {
  const marker = path.join(root, ".next", "BUILD_ID");
  if (!fs.existsSync(marker)) return true;
  const built = fs.statSync(marker).mtimeMs;
  const sources = ["app", "components", "lib", "db", "auth.ts", "proxy.ts", "instrumentation.ts", "next.config.ts", "package-lock.json"]
    .map((p) => path.join(root, p))
    .map((p) => (fs.existsSync(p) && fs.statSync(p).isDirectory() ? newestMtime(p) : fs.existsSync(p) ? fs.statSync(p).mtimeMs : 0));
  return Math.max(...sources) > built;
}

export async function waitForHttp(url: string, timeoutMs = 60_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    try {
      const r = await fetch(url);
      if (r.ok) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
}
