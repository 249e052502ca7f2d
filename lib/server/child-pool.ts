/**
 * A pool of warm child processes (child_process.fork with an IPC channel) that run one job at a
 * time under a memory cap (--max-old-space-size) and a wall-clock budget: the renderer's and the
 * ingest's. A process rather than a worker thread, because V8 aborts the whole process on some
 * out-of-memory paths even inside a worker with resourceLimits (nodejs/node#47224).
 *
 * The child says `{ type: "ready" }` once, then answers each `{ id, … }` job with `{ id, … }`.
 * Idle children are unref'd (they never keep the server, a test run or a script alive), stopped
 * after a while without work, and replaced after a number of jobs; one that timed out, crashed or
 * ran out of memory is killed, and the job settles only once it is gone.
 */
import "server-only";
import { fork, type ChildProcess } from "node:child_process";

export interface PooledChild {
  child: ChildProcess;
  heapMb: number;
  jobs: number;
  ready: Promise<void>;
  /** The tail of the child's stderr: tells an out-of-memory abort from other crashes. */
  stderr: string;
  idleTimer?: ReturnType<typeof setTimeout>;
}

export interface ChildPoolOptions {
  /** The child's script, an absolute path (resolved when a child starts). */
  script: () => string;
  /** The child's full execArgv (fork would otherwise pass on the parent's flags: Next's, Vitest's). */
  execArgv: (heapMb: number) => string[];
  serialization?: "json" | "advanced";
  startupTimeoutMs: number;
  maxIdle: number;
  jobsPerChild: number;
  /** An idle child is stopped after this long without work. */
  idleMs: number;
}

/** How one kind of job reads its child's answers and failures. */
export interface JobHandlers<T, Reply> {
  /** The job's outcome from the child's reply: its value, or an error and whether the child may be kept. */
  reply(m: Reply): { value: T } | { error: Error; keep: boolean };
  /** The child did not start (`reason` says why: no ready message in time, failed to spawn, exited). */
  notStarted(c: PooledChild, reason: Error): Error;
  /** The child exited during the job. */
  exited(c: PooledChild, code: number | null, signal: NodeJS.Signals | null): Error;
  timedOut(): Error;
}

/** True when the child's stderr shows V8 giving up for lack of heap. */
export function ranOutOfMemory(c: PooledChild): boolean {
  return /heap out of memory|Allocation failed|Reached heap limit/i.test(c.stderr);
}

function setRef(child: ChildProcess, on: boolean): void {
  const channel = child.channel as { ref?: () => void; unref?: () => void } | null | undefined;
  if (on) {
    child.ref();
    channel?.ref?.();
  } else {
    child.unref();
    channel?.unref?.();
  }
}

function killAndWait(child: ChildProcess): Promise<void> {
  return new Promise<void>((resolve) => {
    if (child.exitCode !== null || child.signalCode !== null) return resolve();
    child.once("exit", () => resolve());
    // An unref'd child may not report its exit before the process leaves.
    child.ref();
    child.kill("SIGKILL");
  });
}

export class ChildPool {
  private readonly idle: PooledChild[] = [];
  private nextId = 1;

  constructor(private readonly o: ChildPoolOptions) {}

  private spawn(heapMb: number): PooledChild {
    const child = fork(this.o.script(), [], {
      cwd: process.cwd(),
      execArgv: this.o.execArgv(heapMb),
      env: { NODE_ENV: "production" },
      serialization: this.o.serialization ?? "json",
      stdio: ["ignore", "ignore", "pipe", "ipc"],
    });
    const pooled: PooledChild = { child, heapMb, jobs: 0, ready: Promise.resolve(), stderr: "" };
    child.stderr?.on("data", (d: Buffer) => {
      pooled.stderr = (pooled.stderr + d.toString("utf8")).slice(-4000);
    });
    pooled.ready = new Promise<void>((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error("it did not start in time")), this.o.startupTimeoutMs);
      const onMessage = (m: { type?: string }) => {
        if (m?.type !== "ready") return;
        clearTimeout(timer);
        child.off("message", onMessage);
        resolve();
      };
      child.on("message", onMessage);
      child.once("error", (err) => {
        clearTimeout(timer);
        reject(new Error(`it failed: ${err.message}`));
      });
      child.once("exit", (code, signal) => {
        clearTimeout(timer);
        reject(new Error(`it exited (${signal ?? code})`));
      });
    });
    pooled.ready.catch(() => undefined); // observed by the job that awaits it
    child.once("exit", () => {
      const i = this.idle.indexOf(pooled);
      if (i >= 0) this.idle.splice(i, 1);
    });
    return pooled;
  }

  private acquire(heapMb: number): PooledChild {
    const i = this.idle.findIndex((c) => c.heapMb === heapMb);
    if (i < 0) return this.spawn(heapMb);
    const c = this.idle.splice(i, 1)[0];
    clearTimeout(c.idleTimer);
    return c;
  }

  private release(c: PooledChild): void {
    if (c.jobs < this.o.jobsPerChild && this.idle.length < this.o.maxIdle && c.child.connected) {
      setRef(c.child, false);
      c.idleTimer = setTimeout(() => {
        const i = this.idle.indexOf(c);
        if (i >= 0) this.idle.splice(i, 1);
        c.child.kill("SIGKILL");
      }, this.o.idleMs);
      c.idleTimer.unref();
      this.idle.push(c);
    } else {
      c.child.kill("SIGKILL");
    }
  }

  /** Runs one job in a child with a `heapMb` cap, killed at `timeoutMs`. */
  async run<T, Reply extends { id?: number }>(job: Record<string, unknown>, heapMb: number, timeoutMs: number, h: JobHandlers<T, Reply>): Promise<T> {
    const pooled = this.acquire(heapMb);
    const { child } = pooled;
    setRef(child, true);
    try {
      await pooled.ready;
    } catch (err) {
      await killAndWait(child);
      throw h.notStarted(pooled, err as Error);
    }
    pooled.jobs++;
    const id = this.nextId++;
    return new Promise<T>((resolve, reject) => {
      let settled = false;
      const finish = (settle: () => void, keep: boolean) => {
        if (settled) return;
        settled = true;
        clearTimeout(timer);
        child.off("message", onMessage);
        child.off("exit", onExit);
        if (keep) {
          this.release(pooled);
          settle();
        } else {
          // Settle once the child is gone, so the caller's clean-up cannot race a write of the child's.
          void killAndWait(child).then(settle);
        }
      };
      const onMessage = (m: Reply) => {
        if (m?.id !== id) return;
        const out = h.reply(m);
        if ("value" in out) finish(() => resolve(out.value), true);
        else finish(() => reject(out.error), out.keep);
      };
      const onExit = (code: number | null, signal: NodeJS.Signals | null) => finish(() => reject(h.exited(pooled, code, signal)), false);
      const timer = setTimeout(() => finish(() => reject(h.timedOut()), false), timeoutMs);
      child.on("message", onMessage);
      child.once("exit", onExit);
      child.send({ ...job, id }, (err) => {
        if (err) finish(() => reject(h.notStarted(pooled, new Error(`the job could not be sent: ${err.message}`))), false);
      });
    });
  }

  /** Stops the idle children (tests, scripts, graceful shutdown). */
  async stopIdle(): Promise<void> {
    const all = this.idle.splice(0);
    for (const c of all) clearTimeout(c.idleTimer);
    await Promise.all(all.map((c) => killAndWait(c.child)));
  }
}
