/**
 * Mail HTML from react-email, drawn in a child Node process (render/mail-render-child.mjs, forked
 * with IPC). Why not here: React renders HTML (react-dom/server) only outside the react-server
 * condition, and Next's server code and our tsx scripts run under it — the import throws there.
 * The child is plain Node, started from process.cwd() (not `new URL(…, import.meta.url)`, which
 * bundling may rewrite), gets an empty environment, is kept warm for a while and then stopped.
 * Rendering happens when the outbox worker delivers, never inside the transaction that enqueues.
 */
import "server-only";
import { fork, type ChildProcess } from "node:child_process";
import path from "node:path";
import type { MailView } from "./render/mail-views.mjs";

export type { MailView } from "./render/mail-views.mjs";

const STARTUP_TIMEOUT_MS = 20_000;
const BATCH_TIMEOUT_MS = 120_000;
const IDLE_MS = 30_000;

function childPath(root: string = process.cwd()): string {
  return path.join(/* turbopackIgnore: true */ root, "lib", "server", "mail", "render", "mail-render-child.mjs");
}

interface Warm {
  child: ChildProcess;
  ready: Promise<void>;
  idleTimer?: ReturnType<typeof setTimeout>;
}
type Reply = { type?: string; id?: number; html?: Array<string | null>; errors?: string[] };

let warm: Warm | undefined;
let nextId = 1;

function start(): Warm {
  // execArgv: [] — fork would pass on the parent's flags, and --conditions=react-server (tsx scripts) makes react-dom/server throw.
  const child = fork(childPath(), [], { execArgv: [], env: { NODE_ENV: "production" }, stdio: ["ignore", "ignore", "inherit", "ipc"] });
  const w: Warm = { child, ready: Promise.resolve() };
  w.ready = new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("the mail render child did not start")), STARTUP_TIMEOUT_MS);
    child.on("message", function onReady(m: Reply) {
      if (m?.type !== "ready") return;
      clearTimeout(timer);
      child.off("message", onReady);
      resolve();
    });
    child.once("exit", (code, signal) => {
      clearTimeout(timer);
      reject(new Error(`the mail render child exited (${signal ?? code})`));
    });
  });
  w.ready.catch(() => undefined);
  child.once("exit", () => {
    if (warm === w) warm = undefined;
  });
  return w;
}

function park(w: Warm): void {
  clearTimeout(w.idleTimer);
  w.child.unref();
  (w.child.channel as { unref?: () => void } | null | undefined)?.unref?.();
  w.idleTimer = setTimeout(() => w.child.kill(), IDLE_MS);
  w.idleTimer.unref();
}

/**
 * The HTML of each view, in order; null for a view that failed (its mail then goes out as text
 * only, which always carries everything). Throws only when the child cannot run at all.
 */
export async function renderMailHtml(views: MailView[]): Promise<Array<string | null>> {
  if (!views.length) return [];
  warm ??= start();
  const w = warm;
  clearTimeout(w.idleTimer);
  w.child.ref();
  (w.child.channel as { ref?: () => void } | null | undefined)?.ref?.();
  try {
    await w.ready;
    const id = nextId++;
    const reply = await new Promise<Reply>((resolve, reject) => {
      const timer = setTimeout(() => {
        w.child.kill();
        reject(new Error("the mail render child took too long"));
      }, BATCH_TIMEOUT_MS);
      const onMessage = (m: Reply) => {
        if (m?.id !== id) return;
        clearTimeout(timer);
        w.child.off("message", onMessage);
        w.child.off("exit", onExit);
        resolve(m);
      };
      const onExit = () => {
        clearTimeout(timer);
        reject(new Error("the mail render child exited"));
      };
      w.child.on("message", onMessage);
      w.child.once("exit", onExit);
      w.child.send({ id, views });
    });
    if (reply.errors?.length) console.warn(`[prooflight] ${reply.errors.length} mail(s) could not be drawn as HTML: ${reply.errors[0]}`);
    return reply.html ?? views.map(() => null);
  } finally {
    if (warm === w) park(w);
  }
}
