/**
 * Review under load: 32 concurrent clients against one production server (`next start`, ports
 * 3410/2838, throw-away database with the demo seed), each target 2 s warm-up then 10 s timed:
 *
 *   (a) GET /api/ping — fixed JSON, no database: the anchor, in the same run;
 *   (b) GET /api/manuscripts/demo-manuscript — the manuscript board data;
 *   (c) POST /api/threads/{id}/comments — a comment with a unique clientKey.
 *
 * (a) and (b) alternate in 5 slices of 2 s, so that other work on the machine weighs on both
 * alike; (c) runs after them (it grows the threads).
 *
 * Set up first through the API: a figure with 6 panels, each with a revision of a Vega-Lite spec
 * bound to a demo Hahn-echo version, the reviewer required, 2 threads per panel with a reply, and
 * decisions (approved, needs revision). Clients take the API tokens of the members in turn (reads:
 * PI, author, reviewer, viewer; comments: PI, author, reviewer) and the comment phase spreads
 * over the 12 threads. Afterwards the stored comments are counted against the 201s, the server's
 * CPU time per request is read from /proc, and one board read and one comment post are profiled
 * statement by statement in this process (review-profile.ts).
 *
 * Goal (issue 6): board p95 ≤ 3 × anchor p95, 0 errors.
 */
import { withBenchServer, type BenchServer } from "./bench-server";
import { runInterleaved, type LoadOptions, type LoadResult } from "./load";
import { cpuMs, statusKb } from "./proc-stats";
import { printTable, round } from "./report";
import { profileReviewServices, type CpuShare, type ServiceProfile } from "./review-profile";

const APP_PORT = 3410;
const SMTP_PORT = 2838;
const MANUSCRIPT = "demo-manuscript";
const CONNECTIONS = 32;
const WARMUP_MS = 2_000;
const DURATION_MS = 10_000;
/** The anchor and the board alternate in this many slices of DURATION_MS / ROUNDS each. */
const ROUNDS = 5;
const PANELS = 6;
const THREADS_PER_PANEL = 2;
const GOAL_RATIO = 3;
const SPEC = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  mark: "point",
  encoding: { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative" } },
};
const PI = "pi@lab.example.org";
const AUTHOR = "author@lab.example.org";
const REVIEWER = "reviewer@partner.example.org";
const VIEWER = "viewer@lab.example.org";

const doc = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });

export function apiClient(base: string, tokens: Record<string, string>) {
  return async function api<T = any>(who: string, method: string, path: string, body?: unknown): Promise<T> {
    const res = await fetch(`${base}${path}`, {
      method,
      headers: { authorization: `Bearer ${tokens[who]}`, ...(body === undefined ? {} : { "content-type": "application/json" }) },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const text = await res.text();
    if (!res.ok) throw new Error(`${method} ${path} as ${who}: HTTP ${res.status}: ${text.slice(0, 300)}`);
    return JSON.parse(text) as T;
  };
}

/** The figure, panels, revisions, threads and decisions the board and the comments work on. */
export async function setUp(api: ReturnType<typeof apiClient>) {
  const { items } = await api<{ items: Array<{ kind: string; tags: Record<string, string>; latestVersion: { id: string } | null }> }>(
    AUTHOR,
    "GET",
    `/api/manuscripts/${MANUSCRIPT}/datasets`,
  );
  const echo = items.find((d) => d.kind === "hahn_echo" && !d.tags?.derivedFrom && d.latestVersion);
  if (!echo) throw new Error("the demo seed has no Hahn-echo dataset");
  const figure = await api(AUTHOR, "POST", "/api/figures", { manuscriptId: MANUSCRIPT, title: "Bench: coherence of NV03" });
  await api(PI, "PATCH", `/api/figures/${figure.id}`, { requiredReviewers: ["demo-reviewer"] });
  const panels: Array<{ id: string; revisionId: string }> = [];
  const threads: string[] = [];
  for (let i = 0; i < PANELS; i++) {
    const panel = await api(AUTHOR, "POST", `/api/figures/${figure.id}/panels`, { title: `echo ${i + 1}` });
    const rev = await api(AUTHOR, "POST", `/api/panels/${panel.id}/revisions`, {
      spec: SPEC,
      bindings: { echo: { versionId: echo.latestVersion!.id } },
      baseRevisionId: null,
      message: "bench",
    });
    // A new panel is a draft until its author sends it to review; only then may it be decided on.
    await api(AUTHOR, "POST", `/api/panels/${panel.id}/send-to-review`, {});
    panels.push({ id: panel.id, revisionId: rev.id });
    for (let t = 0; t < THREADS_PER_PANEL; t++) {
      const thread = await api(REVIEWER, "POST", `/api/panels/${panel.id}/threads`, {
        body: doc(`Bench thread ${t + 1} on panel ${i + 1}: are the error bars 1σ?`),
        revisionId: rev.id,
        ...(t ? { anchor: { type: "xrange", x0: 1, x1: 2 } } : {}),
      });
      await api(AUTHOR, "POST", `/api/threads/${thread.id}/comments`, { body: doc("Yes, 1σ from the shot noise.") });
      threads.push(thread.id);
    }
    if (i < 3) await api(REVIEWER, "POST", `/api/panels/${panel.id}/approvals`, { revisionId: rev.id, decision: "approved", note: "fine" });
    else if (i === 3)
      await api(REVIEWER, "POST", `/api/panels/${panel.id}/approvals`, { revisionId: rev.id, decision: "needs_revision", note: "axis title lacks units" });
    else if (i === 4) await api(PI, "POST", `/api/panels/${panel.id}/approvals`, { revisionId: rev.id, decision: "approved" });
  }
  await api(REVIEWER, "POST", `/api/threads/${threads[0]}/resolve`, {});
  return { figureId: figure.id as string, panels, threads, echoVersionId: echo.latestVersion!.id };
}

interface Phase {
  name: string;
  load: LoadResult;
  serverCpuMsPerRequest: number | null;
  rssAfterKb: number | null;
}

const loadOptions = (expectStatus: number, request: LoadOptions["request"]): LoadOptions => ({
  connections: CONNECTIONS,
  warmupMs: WARMUP_MS,
  durationMs: DURATION_MS,
  maxRequests: 200_000,
  timeoutMs: 15_000,
  expectStatus,
  request,
});

/** Targets measured in alternation (ROUNDS slices each), with the server's CPU time per request of each. */
async function measure(srv: BenchServer, targets: Array<{ name: string; expectStatus: number; request: LoadOptions["request"] }>): Promise<Phase[]> {
  const pid = srv.server.pid;
  const cpu = targets.map(() => ({ ms: 0, known: true, at: 0 }));
  const loads = await runInterleaved(
    targets.map((t) => loadOptions(t.expectStatus, t.request)),
    targets.length > 1 ? ROUNDS : 1,
    (i, when) => {
      const now = cpuMs(pid);
      if (now === null) {
        cpu[i]!.known = false;
        return;
      }
      if (when === "before") cpu[i]!.at = now;
      else cpu[i]!.ms += now - cpu[i]!.at;
    },
  );
  return targets.map((t, i) => ({
    name: t.name,
    load: loads[i]!,
    rssAfterKb: statusKb(pid, "VmRSS"),
    serverCpuMsPerRequest: cpu[i]!.known && loads[i]!.requests ? round(cpu[i]!.ms / loads[i]!.requests, 3) : null,
  }));
}

export async function benchReview(): Promise<Record<string, unknown>> {
  return withBenchServer({ appPort: APP_PORT, smtpPort: SMTP_PORT, tokensFor: [PI, AUTHOR, REVIEWER, VIEWER], tokenName: "bench review" }, async (srv) => {
    const { base, tokens } = srv;
    const api = apiClient(base, tokens);
    const t0 = performance.now();
    const setup = await setUp(api);
    console.log(
      `  set up through the API in ${((performance.now() - t0) / 1000).toFixed(1)} s: figure ${setup.figureId}, ${PANELS} panels, ${setup.threads.length} threads`,
    );

    const readers = [PI, AUTHOR, REVIEWER, VIEWER].map((e) => ({ authorization: `Bearer ${tokens[e]}` }));
    const writers = [PI, AUTHOR, REVIEWER].map((e) => ({ authorization: `Bearer ${tokens[e]}`, "content-type": "application/json" }));
    const [anchor, board] = (await measure(srv, [
      { name: "GET /api/ping (anchor)", expectStatus: 200, request: () => ({ url: `${base}/api/ping` }) },
      {
        name: `GET /api/manuscripts/${MANUSCRIPT} (board)`,
        expectStatus: 200,
        request: (_seq, c) => ({ url: `${base}/api/manuscripts/${MANUSCRIPT}`, init: { headers: readers[c % readers.length] } }),
      },
    ])) as [Phase, Phase];
    const posted = new Map<string, number>();
    const [comment] = (await measure(srv, [
      {
        name: "POST /api/threads/{id}/comments",
        expectStatus: 201,
        request: (seq, c, phase) => {
          const thread = setup.threads[c % setup.threads.length]!;
          posted.set(thread, (posted.get(thread) ?? 0) + 1);
          return {
            url: `${base}/api/threads/${thread}/comments`,
            init: {
              method: "POST",
              headers: writers[c % writers.length],
              body: JSON.stringify({ body: doc(`bench load ${phase} ${seq} from client ${c}`), clientKey: `bench-load-${phase}-${seq}` }),
            },
          };
        },
      },
    ])) as [Phase];
    const phases = [anchor, board, comment];

    // Every 201 is one stored comment, and no clientKey twice.
    const { getClient } = await import("@/db/client");
    const [stored] = (
      await getClient().execute(
        "SELECT count(*) AS n, count(DISTINCT created_by || ' ' || client_key) AS keys FROM comments WHERE client_key LIKE 'bench-load-%'",
      )
    ).rows;
    const created = (comment.load.statuses["201"] ?? 0) + (comment.load.warmup.statuses["201"] ?? 0);
    const busiest = [...posted].sort((a, b) => b[1] - a[1])[0]![0];

    const ratio = board.load.latencyMs.p95 / anchor.load.latencyMs.p95;
    const cpuRatio = board.serverCpuMsPerRequest && anchor.serverCpuMsPerRequest ? board.serverCpuMsPerRequest / anchor.serverCpuMsPerRequest : NaN;
    const errors = phases.reduce((a, p) => a + p.load.errors, 0);
    const pass = ratio <= GOAL_RATIO && errors === 0;
    const row = (p: Phase) => {
      const l = p.load.latencyMs;
      return [
        p.name,
        l.p50.toFixed(1),
        l.p95.toFixed(1),
        l.p99.toFixed(1),
        l.max.toFixed(0),
        String(p.load.rps.toFixed(0)),
        String(p.load.requests),
        String(p.load.errors),
        p.serverCpuMsPerRequest === null ? "?" : p.serverCpuMsPerRequest.toFixed(2),
        `${(p.load.bytesPerResponse / 1024).toFixed(1)}`,
      ];
    };
    console.log();
    printTable([
      [
        `review, ${CONNECTIONS} clients, ${DURATION_MS / 1000} s each`,
        "p50 ms",
        "p95 ms",
        "p99 ms",
        "max ms",
        "req/s",
        "requests",
        "errors",
        "server CPU ms/req",
        "KiB/resp",
      ],
      ...phases.map(row),
    ]);
    console.log();
    printTable([
      ["goal", "value", "target", ""],
      [
        "board p95 / anchor p95",
        `${ratio.toFixed(2)} × (${board.load.latencyMs.p95.toFixed(1)} / ${anchor.load.latencyMs.p95.toFixed(1)} ms)`,
        `≤ ${GOAL_RATIO} ×`,
        ratio <= GOAL_RATIO ? "PASS" : "MISS",
      ],
      ["errors (all three phases)", String(errors), "0", errors === 0 ? "PASS" : "MISS"],
      ["  (server CPU per request, board / anchor)", `${cpuRatio.toFixed(2)} ×`, "", ""],
      ["goal “≤ 3×, 0 errors”", "", "", pass ? "PASS" : "MISS"],
      [
        "comments stored / 201 answers",
        `${stored?.n} / ${created} (distinct keys ${stored?.keys})`,
        "equal",
        Number(stored?.n) === created && stored?.n === stored?.keys ? "ok" : "MISMATCH",
      ],
    ]);
    for (const p of phases)
      if (p.load.errorSamples.length) console.log(`  ${p.name} errors: ${JSON.stringify(p.load.statuses)}; e.g. ${p.load.errorSamples.join(" | ")}`);

    console.log("\n  profile (this process, same services and database, sequential):");
    const prof = await profileReviewServices({
      token: tokens[REVIEWER]!,
      manuscriptId: MANUSCRIPT,
      threadId: busiest,
      boardIterations: 200,
      commentIterations: 30,
    });
    const showProfile = (title: string, p: ServiceProfile & { cpu: CpuShare[] }) => {
      console.log();
      printTable([
        [title, "mean ms", "p95 ms"],
        ...p.stages.map((s) => [s.stage, s.meanMs.toFixed(3), s.p95Ms.toFixed(3)]),
        [
          `total (${p.statementsPerRequest} SQL statements, ${p.sqlMsPerRequest.toFixed(3)} ms in SQL; ${(p.responseBytes / 1024).toFixed(1)} KiB JSON)`,
          p.totalMsPerRequest.toFixed(3),
          "",
        ],
      ]);
      console.log();
      printTable([
        ["statement", "per req", "mean ms", "ms/req"],
        ...p.statements.slice(0, 12).map((s) => [s.sql, String(s.perRequest), s.meanMs.toFixed(3), s.msPerRequest.toFixed(3)]),
      ]);
      console.log();
      printTable([
        ["CPU profile (self time, sampled)", "share %", "ms/req"],
        ...p.cpu.slice(0, 10).map((c) => [c.owner, c.share.toFixed(1), c.msPerRequest.toFixed(3)]),
      ]);
    };
    console.log(`  SQLite: journal_mode=${prof.settings.journalMode}, synchronous=${prof.settings.synchronous} (2 = FULL: every commit syncs the WAL)`);
    showProfile("board read (GET /api/manuscripts/{id})", prof.board);
    showProfile(`comment post (thread with ${prof.comment.threadComments} comments at the end)`, prof.comment);
    console.log(
      `  getThread alone on that thread: ${prof.comment.getThreadMeanMs.toFixed(3)} ms; comments posted per thread under load: ${Math.round(created / setup.threads.length)} on average`,
    );
    console.log(`  server: pid ${srv.server.pid} (${srv.server.comm}); build ${srv.build}; ready in ${(srv.readyMs / 1000).toFixed(1)} s`);

    return {
      connections: CONNECTIONS,
      warmupMs: WARMUP_MS,
      durationMs: DURATION_MS,
      anchorBoardRounds: ROUNDS,
      setup: { panels: PANELS, threads: setup.threads.length, commentsPostedPerThread: Object.fromEntries(posted) },
      phases: Object.fromEntries(phases.map((p) => [p.name, { ...p.load, serverCpuMsPerRequest: p.serverCpuMsPerRequest, rssAfterKb: p.rssAfterKb }])),
      goal: { target: `board p95 ≤ ${GOAL_RATIO} × anchor p95, 0 errors`, ratio: round(ratio, 2), errors, pass, serverCpuRatio: round(cpuRatio, 2) },
      comments: { stored: Number(stored?.n), distinctKeys: Number(stored?.keys), created201: created },
      profile: prof,
      build: srv.build,
      serverReadyMs: Math.round(srv.readyMs),
    };
  });
}
