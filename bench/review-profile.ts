/**
 * Where the time of one board read and one comment post goes: the same service calls the route
 * handlers make, run in this process against the bench database (process.env points at it while
 * the bench server runs), with every SQL statement timed by wrapping the libSQL client. Run
 * sequentially after the load phases, so it shows service time, not queueing.
 */
import { Session } from "node:inspector/promises";
import path from "node:path";
import type { Client, InStatement, TransactionMode } from "@libsql/client";
import { percentile, round } from "./report";

interface Executes {
  execute(stmt: InStatement): Promise<unknown>;
}

/**
 * Wraps execute (of the client and of every transaction it opens) and begin/commit; `log` collects
 * while `on`. Statements started together (Promise.all) are run one after the other, so each is
 * timed alone rather than with the ones queued before it.
 */
function instrument(client: Client) {
  const state = { on: false, log: [] as Array<{ sql: string; ms: number }>, restore: () => {} };
  const record = (sql: string, t0: number) => {
    if (state.on) state.log.push({ sql, ms: performance.now() - t0 });
  };
  let queue: Promise<unknown> = Promise.resolve();
  const wrap = (target: Executes) => {
    const orig = target.execute.bind(target);
    target.execute = (stmt: InStatement) => {
      const run = queue.then(async () => {
        const t0 = performance.now();
        try {
          return await orig(stmt);
        } finally {
          record(typeof stmt === "string" ? stmt : stmt.sql, t0);
        }
      });
      queue = run.catch(() => undefined);
      return run;
    };
  };
  const origExecute = client.execute;
  const origTransaction = client.transaction;
  state.restore = () => {
    client.execute = origExecute;
    client.transaction = origTransaction;
  };
  wrap(client as unknown as Executes);
  const origTx = client.transaction.bind(client);
  client.transaction = (async (mode?: TransactionMode) => {
    const t0 = performance.now();
    const tx = await origTx(mode);
    record(`BEGIN ${(mode ?? "write").toUpperCase()}`, t0);
    wrap(tx as unknown as Executes);
    const commit = tx.commit.bind(tx);
    tx.commit = async () => {
      const c0 = performance.now();
      try {
        return await commit();
      } finally {
        record("COMMIT", c0);
      }
    };
    return tx;
  }) as Client["transaction"];
  return state;
}

/** A statement reduced to what identifies it: column lists folded, values gone. */
function shortSql(sql: string): string {
  return sql
    .replace(/^select .*? from /i, "select … from ")
    .replace(/^insert into ("\w+") \(.*?\) values .*/i, "insert into $1 …")
    .replace(/^update ("\w+") set .*? where /i, "update $1 set … where ")
    .replace(/\s+/g, " ")
    .slice(0, 110);
}

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string };
  hitCount?: number;
}

/** Where a sampled frame's code lives: a package of node_modules, a file of ours, or V8/Node itself. */
function codeOwner(frame: ProfileNode["callFrame"]): string {
  const { url, functionName } = frame;
  // Once any napi-rs addon is loaded (resvg is, in this process), V8 names the samples taken inside
  // libsql's native calls (SQLite stepping rows) after napi-rs's `custom_gc`; without one they show
  // as libsql_js::statement::Rows::js_next. Both are SQLite's own time.
  if (!url)
    return functionName.startsWith("(")
      ? functionName
      : /libsql|^custom_gc$/.test(functionName)
        ? "libsql native (SQLite)"
        : `native: ${functionName || "(anonymous)"}`;
  if (url.startsWith("node:")) return "(Node internals)";
  const pkg = /node_modules\/((?:@[^/]+\/)?[^/]+)/.exec(url);
  if (pkg) return pkg[1]!;
  const file = url.replace(/^file:\/\//, "");
  return path.relative(process.cwd(), file.split("?")[0]!);
}

export interface CpuShare {
  owner: string;
  share: number;
  msPerRequest: number;
}

/** A sampling CPU profile (V8 inspector, 100 µs) of `iterations` calls of `run`, self time grouped by owner. */
async function cpuProfile(iterations: number, run: (i: number) => Promise<unknown>): Promise<CpuShare[]> {
  const session = new Session();
  session.connect();
  try {
    await session.post("Profiler.enable");
    await session.post("Profiler.setSamplingInterval", { interval: 100 });
    await session.post("Profiler.start");
    const t0 = performance.now();
    for (let i = 0; i < iterations; i++) await run(i);
    const wallMs = performance.now() - t0;
    const { profile } = (await session.post("Profiler.stop")) as unknown as { profile: { nodes: ProfileNode[] } };
    const hits = new Map<string, number>();
    let total = 0;
    for (const n of profile.nodes) {
      const h = n.hitCount ?? 0;
      if (!h || n.callFrame.functionName === "(idle)") continue;
      const owner = codeOwner(n.callFrame);
      hits.set(owner, (hits.get(owner) ?? 0) + h);
      total += h;
    }
    // Samples are spread over the busy wall time of the loop; scale shares to ms per request.
    return [...hits]
      .map(([owner, h]) => ({ owner, share: round((100 * h) / total, 1), msPerRequest: round(((h / total) * wallMs) / iterations, 3) }))
      .sort((a, b) => b.share - a.share);
  } finally {
    session.disconnect();
  }
}

export interface StageTiming {
  stage: string;
  meanMs: number;
  p95Ms: number;
}
export interface StatementTiming {
  sql: string;
  perRequest: number;
  meanMs: number;
  msPerRequest: number;
}
export interface ServiceProfile {
  iterations: number;
  stages: StageTiming[];
  statements: StatementTiming[];
  statementsPerRequest: number;
  sqlMsPerRequest: number;
  totalMsPerRequest: number;
  responseBytes: number;
}

async function profile(iterations: number, state: ReturnType<typeof instrument>, stages: Array<[string, () => Promise<unknown>]>): Promise<ServiceProfile> {
  const times = new Map<string, number[]>(stages.map(([s]) => [s, []]));
  state.log = [];
  let responseBytes = 0;
  for (let i = 0; i < iterations; i++) {
    for (const [stage, run] of stages) {
      const t0 = performance.now();
      state.on = true;
      const out = await run();
      state.on = false;
      times.get(stage)!.push(performance.now() - t0);
      if (stage === "JSON.stringify") responseBytes = (out as string).length;
    }
  }
  const bySql = new Map<string, number[]>();
  for (const { sql, ms } of state.log) bySql.set(shortSql(sql), [...(bySql.get(shortSql(sql)) ?? []), ms]);
  const statements = [...bySql]
    .map(([sql, ms]) => ({
      sql,
      perRequest: round(ms.length / iterations, 2),
      meanMs: round(ms.reduce((a, b) => a + b, 0) / ms.length, 3),
      msPerRequest: round(ms.reduce((a, b) => a + b, 0) / iterations, 3),
    }))
    .sort((a, b) => b.msPerRequest - a.msPerRequest);
  const stageRows = [...times].map(([stage, t]) => ({ stage, meanMs: round(t.reduce((a, b) => a + b, 0) / t.length, 3), p95Ms: round(percentile(t, 95), 3) }));
  return {
    iterations,
    stages: stageRows,
    statements,
    statementsPerRequest: round(state.log.length / iterations, 1),
    sqlMsPerRequest: round(state.log.reduce((a, b) => a + b.ms, 0) / iterations, 3),
    totalMsPerRequest: round(
      stageRows.reduce((a, b) => a + b.meanMs, 0),
      3,
    ),
    responseBytes,
  };
}

/**
 * The board read (token lookup, the gate's authorize, getManuscript, JSON) and a comment post
 * (token lookup, the gate's scope + authorize, replyToThread, JSON) on `threadId`.
 */
export async function profileReviewServices(opts: {
  token: string;
  manuscriptId: string;
  threadId: string;
  boardIterations: number;
  commentIterations: number;
}) {
  const { getClient } = await import("@/db/client");
  const { userForApiToken } = await import("@/lib/server/api-tokens");
  const { authorize } = await import("@/lib/authz");
  const { getManuscript } = await import("@/lib/server/manuscripts");
  const { manuscriptOfThread, replyToThread, getThread } = await import("@/lib/server/review/threads");
  const { plainDoc } = await import("@/lib/review/rich-text");
  const client = getClient();
  const pragma = async (name: string) => (await client.execute(`PRAGMA ${name}`)).rows[0]?.[0];
  const settings = { journalMode: String(await pragma("journal_mode")), synchronous: Number(await pragma("synchronous")) };
  const state = instrument(client);
  const user = (await userForApiToken(opts.token))!;
  let board: unknown;
  let thread: unknown;
  // One untimed round loads the modules and warms SQLite's page cache.
  await getManuscript(user, opts.manuscriptId);
  const boardProfile = await profile(opts.boardIterations, state, [
    ["token lookup (userForApiToken)", () => userForApiToken(opts.token)],
    ["gate: authorize", () => authorize(user, "manuscript.read", opts.manuscriptId)],
    [
      "getManuscript",
      async () => {
        board = await getManuscript(user, opts.manuscriptId);
      },
    ],
    ["JSON.stringify", async () => JSON.stringify(board)],
  ]);
  let k = 0;
  const commentProfile = await profile(opts.commentIterations, state, [
    ["token lookup (userForApiToken)", () => userForApiToken(opts.token)],
    ["gate: scope (manuscriptOfThread) + authorize", async () => authorize(user, "comment.write", await manuscriptOfThread(opts.threadId))],
    [
      "replyToThread (incl. getThread)",
      async () => {
        thread = await replyToThread(user, opts.threadId, { body: plainDoc(`profile comment ${k}`), clientKey: `bench-profile-${k++}` });
      },
    ],
    ["JSON.stringify", async () => JSON.stringify(thread)],
  ]);
  const getThreadProfile = await profile(opts.commentIterations, state, [["getThread alone", () => getThread(user, opts.threadId)]]);
  const comments = (thread as { comments: unknown[] }).comments.length;
  state.restore();
  // Without the statement timer, what code the CPU runs: the board read and the comment post end to end (minus HTTP and Next).
  const boardCpu = await cpuProfile(opts.boardIterations * 2, async () => {
    const u = (await userForApiToken(opts.token))!;
    await authorize(u, "manuscript.read", opts.manuscriptId);
    return JSON.stringify(await getManuscript(u, opts.manuscriptId));
  });
  const commentCpu = await cpuProfile(opts.commentIterations, async (i) => {
    const u = (await userForApiToken(opts.token))!;
    await authorize(u, "comment.write", await manuscriptOfThread(opts.threadId));
    return JSON.stringify(await replyToThread(u, opts.threadId, { body: plainDoc(`profiled comment ${i}`), clientKey: `bench-cpu-profile-${i}` }));
  });
  return {
    settings,
    board: { ...boardProfile, cpu: boardCpu },
    comment: { ...commentProfile, threadComments: comments, getThreadMeanMs: getThreadProfile.stages[0]!.meanMs, cpu: commentCpu },
  };
}
