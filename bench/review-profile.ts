/**
 * Where the time of one board read and one comment post goes: the same service calls the route
 * handlers make, run in this process against the bench database (process.env points at it while
 * the bench server runs), with every SQL statement timed by wrapping the libSQL client. Run
 * sequentially after the load phases, so it shows service time, not queueing.
 */
import type { Client, InStatement, TransactionMode } from "@libsql/client";
import { percentile, round } from "./report";

interface Executes { execute(stmt: InStatement): Promise<unknown> }

/** Wraps execute (of the client and of every transaction it opens) and begin/commit; `log` collects while `on`. */
function instrument(client: Client) {
  const state = { on: false, log: [] as Array<{ sql: string; ms: number }> };
  const record = (sql: string, t0: number) => { if (state.on) state.log.push({ sql, ms: performance.now() - t0 }); };
  const wrap = (target: Executes) => {
    const orig = target.execute.bind(target);
    target.execute = async (stmt: InStatement) => {
      const t0 = performance.now();
      try { return await orig(stmt); } finally { record(typeof stmt === "string" ? stmt : stmt.sql, t0); }
    };
  };
  wrap(client as unknown as Executes);
  const origTx = client.transaction.bind(client);
  client.transaction = (async (mode?: TransactionMode) => {
    const t0 = performance.now();
    const tx = await origTx(mode);
    record(`BEGIN ${(mode ?? "write").toUpperCase()}`, t0);
    wrap(tx as unknown as Executes);
    const commit = tx.commit.bind(tx);
    tx.commit = async () => { const c0 = performance.now(); try { return await commit(); } finally { record("COMMIT", c0); } };
    return tx;
  }) as Client["transaction"];
  return state;
}

/** A statement reduced to what identifies it: column lists folded, values gone. */
function shortSql(sql: string): string {
  return sql.replace(/^select .*? from /i, "select … from ").replace(/^insert into ("\w+") \(.*?\) values .*/i, "insert into $1 …")
    .replace(/^update ("\w+") set .*? where /i, "update $1 set … where ").replace(/\s+/g, " ").slice(0, 110);
}

export interface StageTiming { stage: string; meanMs: number; p95Ms: number }
export interface StatementTiming { sql: string; perRequest: number; meanMs: number; msPerRequest: number }
export interface ServiceProfile { iterations: number; stages: StageTiming[]; statements: StatementTiming[]; statementsPerRequest: number; sqlMsPerRequest: number; totalMsPerRequest: number; responseBytes: number }

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
  const statements = [...bySql].map(([sql, ms]) => ({
    sql, perRequest: round(ms.length / iterations, 2), meanMs: round(ms.reduce((a, b) => a + b, 0) / ms.length, 3),
    msPerRequest: round(ms.reduce((a, b) => a + b, 0) / iterations, 3),
  })).sort((a, b) => b.msPerRequest - a.msPerRequest);
  const stageRows = [...times].map(([stage, t]) => ({ stage, meanMs: round(t.reduce((a, b) => a + b, 0) / t.length, 3), p95Ms: round(percentile(t, 95), 3) }));
  return {
    iterations, stages: stageRows, statements,
    statementsPerRequest: round(state.log.length / iterations, 1),
    sqlMsPerRequest: round(state.log.reduce((a, b) => a + b.ms, 0) / iterations, 3),
    totalMsPerRequest: round(stageRows.reduce((a, b) => a + b.meanMs, 0), 3),
    responseBytes,
  };
}

/**
 * The board read (token lookup, the gate's authorize, getManuscript, JSON) and a comment post
 * (token lookup, the gate's scope + authorize, replyToThread, JSON) on `threadId`.
 */
export async function profileReviewServices(opts: { token: string; manuscriptId: string; threadId: string; boardIterations: number; commentIterations: number }) {
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
    ["getManuscript", async () => { board = await getManuscript(user, opts.manuscriptId); }],
    ["JSON.stringify", async () => JSON.stringify(board)],
  ]);
  let k = 0;
  const commentProfile = await profile(opts.commentIterations, state, [
    ["token lookup (userForApiToken)", () => userForApiToken(opts.token)],
    ["gate: scope (manuscriptOfThread) + authorize", async () => authorize(user, "comment.write", await manuscriptOfThread(opts.threadId))],
    ["replyToThread (incl. getThread)", async () => { thread = await replyToThread(user, opts.threadId, { body: plainDoc(`profile comment ${k}`), clientKey: `bench-profile-${k++}` }); }],
    ["JSON.stringify", async () => JSON.stringify(thread)],
  ]);
  const getThreadProfile = await profile(opts.commentIterations, state, [["getThread alone", () => getThread(user, opts.threadId)]]);
  const comments = (thread as { comments: unknown[] }).comments.length;
  return { settings, board: boardProfile, comment: { ...commentProfile, threadComments: comments, getThreadMeanMs: getThreadProfile.stages[0]!.meanMs } };
}
