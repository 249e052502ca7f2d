/**
 * What each request of the load mix costs the app itself, without HTTP and Next: the route
 * handlers called in this process (the way Next calls them) against a throw-away database with the
 * demo seed and the figure, panels and threads bench/review.ts sets up. For each kind: CPU ms and
 * wall ms per request (sequential, after a warm-up), SQL statements and answer bytes per request.
 *
 * A quick loop for work on the hot paths: it needs no build and runs in about half a minute. Route
 * modules import Next's client hooks, which the react-server condition the other benchmarks run
 * under leaves out, so this one runs in a child with `server-only` mapped to its empty module
 * (tsconfig.in-process.json), as the API tests do. Comments are posted as the app's pages post them
 * (Prefer: return=minimal) and, as a kind of their own, with the whole thread read back as a script
 * would. SERVICE_KINDS=board,queue picks kinds;
 * SERVICE_HISTORY=n posts n comments and n/2 decisions first; SERVICE_SQL=1 prints one request's statements.
 */
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Client, InStatement } from "@libsql/client";
import { round } from "./report";
import { setUp } from "./review";

const WARMUP = 30;
const REQUESTS = Number(process.env.SERVICE_REQUESTS ?? 300);
const EMAIL = { pi: "pi@lab.example.org", author: "author@lab.example.org", reviewer: "reviewer@partner.example.org", viewer: "viewer@lab.example.org" };

type Handler = (req: Request, ctx: { params: Promise<Record<string, string>> }) => Promise<Response>;
interface Route {
  pattern: RegExp;
  names: string[];
  file: string;
}

function routes(): Route[] {
  const appDir = path.join(process.cwd(), "app");
  const out: Route[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.name === "route.ts") {
        const segs = path
          .relative(appDir, dir)
          .split(path.sep)
          .filter((s) => !/^\(.*\)$/.test(s));
        const names: string[] = [];
        const re = segs.map((s) => (/^\[(\w+)\]$/.test(s) ? (names.push(s.slice(1, -1)), "([^/]+)") : s.replace(/[.]/g, "\\.")));
        out.push({ pattern: new RegExp(`^/${re.join("/")}$`), names, file: p });
      }
    }
  };
  walk(appDir);
  return out;
}

async function measure(): Promise<Record<string, unknown>> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-service-cost-"));
  Object.assign(process.env, {
    DATABASE_URL: `file:${path.join(dir, "app.db")}`,
    UPLOADS_DIR: path.join(dir, "uploads"),
    MAIL_SINK_DIR: path.join(dir, "mail"),
    AUTH_SECRET: "bench-secret-bench-secret-bench-secret-01",
    SMTP_PORT: "2858",
    COMMENTS_PER_MINUTE: "1000000",
  });
  delete process.env.SMTP_URL;
  const { resetEnvForTests } = await import("@/lib/env");
  resetEnvForTests();
  const { applyMigrations } = await import("@/db/migrate");
  const { getClient } = await import("@/db/client");
  const { seedDemoWithData } = await import("@/lib/server/demo/seed-demo");
  const { DEMO_ACCOUNTS } = await import("@/lib/demo-data/accounts");
  const { createApiToken } = await import("@/lib/server/api-tokens");
  await applyMigrations();
  await seedDemoWithData();
  const tokens: Record<string, string> = {};
  for (const a of DEMO_ACCOUNTS) tokens[a.email] = (await createApiToken({ id: a.id, email: a.email, name: a.name }, { name: "bench" })).token;

  const table = routes();
  const modules = new Map<string, Record<string, Handler>>();
  const send = async (who: string, method: string, url: string, body?: unknown, extra?: Record<string, string>) => {
    const pathname = url.split("?")[0]!;
    const route = table.find((r) => r.pattern.test(pathname));
    if (!route) throw new Error(`no route for ${pathname}`);
    if (!modules.has(route.file)) modules.set(route.file, (await import(route.file)) as Record<string, Handler>);
    const m = route.pattern.exec(pathname)!;
    const params = Object.fromEntries(route.names.map((n, i) => [n, decodeURIComponent(m[i + 1]!)]));
    const headers = new Headers({ ...extra, authorization: `Bearer ${tokens[who]}` });
    if (body !== undefined) headers.set("content-type", "application/json");
    const req = new Request(`http://localhost:3000${url}`, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
    return modules.get(route.file)![method]!(req, { params: Promise.resolve(params) });
  };
  const api = async <T = any>(who: string, method: string, url: string, body?: unknown): Promise<T> => {
    const res = await send(who, method, url, body);
    const text = await res.text();
    if (!res.ok) throw new Error(`${method} ${url} as ${who}: HTTP ${res.status}: ${text.slice(0, 300)}`);
    return JSON.parse(text) as T;
  };
  const setup = await setUp(api);

  const client = getClient();
  let statements = 0;
  let logged: string[] | null = null;
  const count = (target: { execute(s: InStatement): Promise<unknown> }) => {
    const orig = target.execute.bind(target);
    target.execute = (s: InStatement) => (statements++, logged?.push(typeof s === "string" ? s : s.sql), orig(s));
  };
  count(client as unknown as { execute(s: InStatement): Promise<unknown> });
  const origTx = client.transaction.bind(client);
  client.transaction = (async (mode) => {
    statements++;
    const tx = await origTx(mode);
    count(tx as unknown as { execute(s: InStatement): Promise<unknown> });
    return tx;
  }) as Client["transaction"];

  const readers = [EMAIL.pi, EMAIL.author, EMAIL.reviewer, EMAIL.viewer];
  const doc = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });
  // A comment as the app's pages post it (Prefer: return=minimal), and as a script that reads the whole thread back.
  const reply = (i: number, extra?: Record<string, string>): [string, string, string, unknown, Record<string, string>?] => [
    [EMAIL.pi, EMAIL.author, EMAIL.reviewer][i % 3]!,
    "POST",
    `/api/threads/${setup.threads[i % setup.threads.length]}/comments`,
    { body: doc(`cost ${i}`), clientKey: `service-cost-${i}-${extra ? "minimal" : "whole"}` },
    extra,
  ];
  const kinds: Record<string, (i: number) => [string, string, string, unknown?, Record<string, string>?]> = {
    board: (i) => [readers[i % 4]!, "GET", "/api/manuscripts/demo-manuscript"],
    rows: (i) => [readers[i % 4]!, "GET", `/api/versions/${setup.echoVersionId}/rows?offset=${(i * 7) % 60}&limit=20`],
    queue: (i) => [readers[i % 4]!, "GET", "/api/review-queue"],
    comment: (i) => reply(i, { prefer: "return=minimal" }),
    "comment, whole thread back": (i) => reply(i),
    decision: (i) => {
      const panel = setup.panels[i % setup.panels.length]!;
      return [
        [EMAIL.reviewer, EMAIL.pi][i % 2]!,
        "POST",
        `/api/panels/${panel.id}/approvals`,
        { revisionId: panel.revisionId, decision: i % 3 ? "approved" : "needs_revision", note: `cost ${i}` },
      ];
    },
  };
  // A review history first (untimed), as the load's soak leaves one: what grows with it shows.
  const history = Number(process.env.SERVICE_HISTORY ?? 0);
  for (let i = 0; i < history; i++) {
    await (await send(...kinds.comment!(100_000 + i))).arrayBuffer();
    if (i % 2 === 0) await (await send(...kinds.decision!(100_000 + i))).arrayBuffer();
  }
  const result: Record<string, { cpuMs: number; wallMs: number; statements: number; answerBytes: number }> = {};
  const only = process.env.SERVICE_KINDS?.split(",");
  for (const [kind, make] of Object.entries(kinds).filter(([k]) => !only || only.includes(k))) {
    for (let i = 0; i < WARMUP; i++) await (await send(...make(i))).arrayBuffer();
    statements = 0;
    let bytes = 0;
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    for (let i = WARMUP; i < WARMUP + REQUESTS; i++) {
      const res = await send(...make(i));
      bytes += (await res.arrayBuffer()).byteLength;
      if (res.status >= 400) throw new Error(`${kind}: HTTP ${res.status}`);
    }
    const wall = performance.now() - t0;
    const cpu = process.cpuUsage(c0);
    if (process.env.SERVICE_SQL) {
      logged = [];
      await (await send(...make(WARMUP + REQUESTS))).arrayBuffer();
      console.log(`\n  ${kind}: the statements of one request\n${logged.map((q, i) => `  ${i + 1}. ${q}`).join("\n")}`);
      logged = null;
    }
    result[kind] = {
      cpuMs: round((cpu.user + cpu.system) / 1000 / REQUESTS, 3),
      wallMs: round(wall / REQUESTS, 3),
      statements: round(statements / REQUESTS, 1),
      answerBytes: Math.round(bytes / REQUESTS),
    };
  }
  console.table(result);
  fs.rmSync(dir, { recursive: true, force: true });
  return { requestsPerKind: REQUESTS, perRequest: result };
}

const RESULT_MARK = "service-cost result: ";

export async function benchServiceCost(): Promise<Record<string, unknown>> {
  const out = execFileSync(path.join("node_modules", ".bin", "tsx"), ["--tsconfig", "bench/tsconfig.in-process.json", "bench/service-cost.ts"], {
    env: { ...process.env, SERVICE_COST_CHILD: "1" },
    encoding: "utf8",
    stdio: ["ignore", "pipe", "inherit"],
    maxBuffer: 64 * 2 ** 20,
  });
  const line = out.split("\n").find((l) => l.startsWith(RESULT_MARK));
  process.stdout.write(
    out
      .split("\n")
      .filter((l) => !l.startsWith(RESULT_MARK))
      .join("\n"),
  );
  if (!line) throw new Error("the service-cost child printed no result");
  return JSON.parse(line.slice(RESULT_MARK.length)) as Record<string, unknown>;
}

if (process.env.SERVICE_COST_CHILD) {
  const result = await measure();
  console.log(`${RESULT_MARK}${JSON.stringify(result)}`);
  process.exit(0);
}
