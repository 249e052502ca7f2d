/**
 * A lab's day under load: `next start` (ports 3420/2848, throw-away database with the demo seed and
 * the figure, panels, threads and decisions bench/review.ts sets up) with a mixed closed-loop
 * workload beside a bare route in the same run:
 *
 *   board reads (GET /api/manuscripts/{id}) 35 %, rows paging (GET /api/versions/{id}/rows) 25 %,
 *   the review queue (GET /api/review-queue) 15 %, comments (POST …/comments, as the app's pages post
 *   them: `Prefer: return=minimal`, so the answer is the new comment, not its growing thread) 15 %, review
 *   decisions (POST /api/panels/{id}/approvals) 10 %; each request drawn from a seeded sequence.
 *
 * At 32 and at 128 clients, the mix and GET /api/ping alternate in 5 slices (2 s warm-up, 10 s
 * timed each), so other work on the machine weighs on both. Inside the mix, one client sends only
 * the bare route: its latency is the wait every request has in the loaded server's queue. Then a soak: the mix at 32 clients for
 * LOAD_SOAK_MS (10 minutes by default) with the server's resident memory sampled every 5 s; the
 * slope after the first fifth is the growth. Each kind's service time (one client, one request
 * after another) is measured before the load and after the soak, so what grows with the history
 * the load leaves behind (comments, decisions) shows.
 *
 * Goals (issue 15): board p95 ≤ 2 × bare p95 at 32 clients; 0 errors at 128.
 */
import { withBenchServer } from "./bench-server";
import { runInterleaved, type LoadOptions, type LoadRequest, type LoadResult } from "./load";
import { statusKb } from "./proc-stats";
import { round } from "./report";
import { apiClient, setUp } from "./review";

const APP_PORT = 3420;
const SMTP_PORT = 2848;
const MANUSCRIPT = "demo-manuscript";
const PI = "pi@lab.example.org";
const AUTHOR = "author@lab.example.org";
const REVIEWER = "reviewer@partner.example.org";
const VIEWER = "viewer@lab.example.org";
const WARMUP_MS = 2_000;
const DURATION_MS = 10_000;
const ROUNDS = 5;
const SAMPLE_MS = 5_000;
const GOAL_RATIO = 2;
const SERVICE_WARMUP = 20;
const SERVICE_REQUESTS = 100;
const MIX: Array<[string, number]> = [
  ["board", 35],
  ["rows", 25],
  ["queue", 15],
  ["comment", 15],
  ["decision", 10],
];

const doc = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });

/** A seeded choice of kind for request number `seq` (the same sequence every run). */
function kindOf(seq: number): string {
  let h = (seq + 0x9e3779b9) | 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  const u = ((h ^ (h >>> 16)) >>> 0) % 100;
  let acc = 0;
  for (const [kind, weight] of MIX) if (u < (acc += weight)) return kind;
  return MIX[0]![0];
}

function leastSquaresSlope(points: Array<[number, number]>): number {
  const n = points.length;
  if (n < 2) return NaN;
  const mx = points.reduce((a, p) => a + p[0], 0) / n;
  const my = points.reduce((a, p) => a + p[1], 0) / n;
  const sxy = points.reduce((a, p) => a + (p[0] - mx) * (p[1] - my), 0);
  const sxx = points.reduce((a, p) => a + (p[0] - mx) ** 2, 0);
  return sxy / sxx;
}

export async function benchLoadMix(): Promise<Record<string, unknown>> {
  const soakMs = Number(process.env.LOAD_SOAK_MS ?? 600_000);
  return withBenchServer({ appPort: APP_PORT, smtpPort: SMTP_PORT, tokensFor: [PI, AUTHOR, REVIEWER, VIEWER], tokenName: "bench load" }, async (srv) => {
    const { base, tokens } = srv;
    const setup = await setUp(apiClient(base, tokens));
    const auth = (e: string) => ({ authorization: `Bearer ${tokens[e]}` });
    const json = (e: string) => ({ ...auth(e), "content-type": "application/json" });
    const readers = [PI, AUTHOR, REVIEWER, VIEWER];
    const deciders = [REVIEWER, PI];
    const commenters = [PI, AUTHOR, REVIEWER];

    // Client 0 of the load sends only the bare route: its latency is the queue every request waits in,
    // so the board's own cost shows beside it (the other clients draw the mix).
    const withProbe = (seq: number, c: number, phase: string): LoadRequest =>
      c === 0 ? { kind: "ping (inside the load)", url: `${base}/api/ping` } : mixed(seq, c, phase);
    const mixed = (seq: number, c: number, phase: string): LoadRequest => {
      const kind = kindOf(seq);
      switch (kind) {
        case "rows":
          return { kind, url: `${base}/api/versions/${setup.echoVersionId}/rows?offset=${(seq * 7) % 60}&limit=20`, init: { headers: auth(readers[c % 4]!) } };
        case "queue":
          return { kind, url: `${base}/api/review-queue`, init: { headers: auth(readers[c % 4]!) } };
        case "comment": {
          const thread = setup.threads[c % setup.threads.length]!;
          return {
            kind,
            expectStatus: 201,
            url: `${base}/api/threads/${thread}/comments`,
            init: {
              method: "POST",
              headers: { ...json(commenters[c % 3]!), prefer: "return=minimal" },
              body: JSON.stringify({ body: doc(`load ${phase} ${seq} from client ${c}`), clientKey: `load-mix-${phase}-${seq}` }),
            },
          };
        }
        case "decision": {
          const panel = setup.panels[seq % setup.panels.length]!;
          return {
            kind,
            expectStatus: 201,
            url: `${base}/api/panels/${panel.id}/approvals`,
            init: {
              method: "POST",
              headers: json(deciders[c % 2]!),
              body: JSON.stringify({ revisionId: panel.revisionId, decision: seq % 3 ? "approved" : "needs_revision", note: `load ${seq}` }),
            },
          };
        }
        default:
          return { kind: "board", url: `${base}/api/manuscripts/${MANUSCRIPT}`, init: { headers: auth(readers[c % 4]!) } };
      }
    };
    const target = (connections: number, request: LoadOptions["request"], durationMs = DURATION_MS): LoadOptions => ({
      connections,
      warmupMs: WARMUP_MS,
      durationMs,
      maxRequests: 2_000_000,
      timeoutMs: 30_000,
      expectStatus: 200,
      request,
    });

    // What each kind costs the server alone: one client, requests one after another, after a warm-up.
    // Measured before the load and again after the soak, to show what grows with the history the load leaves.
    type ServiceTimes = Record<string, { requests: number; meanMs: number; p50Ms: number; p95Ms: number }>;
    const serviceTimes = async (phase: string): Promise<ServiceTimes> => {
      const service: ServiceTimes = {};
      let drawn = 0;
      for (const [kind] of MIX) {
        const times: number[] = [];
        for (let seq = 0; seq < SERVICE_WARMUP + SERVICE_REQUESTS; seq++) {
          let request: LoadRequest;
          do request = mixed(drawn++, seq, phase);
          while (request.kind !== kind);
          const t0 = performance.now();
          const res = await fetch(request.url, request.init);
          await res.arrayBuffer();
          if (seq >= SERVICE_WARMUP) times.push(performance.now() - t0);
        }
        times.sort((a, b) => a - b);
        service[kind] = {
          requests: times.length,
          meanMs: round(times.reduce((a, b) => a + b, 0) / times.length, 2),
          p50Ms: round(times[Math.floor(times.length / 2)]!, 2),
          p95Ms: round(times[Math.floor(times.length * 0.95)]!, 2),
        };
      }
      return service;
    };
    const service = await serviceTimes("service");
    console.log("\n  service time by kind (one client, sequential), before the load:");
    console.table(service);

    // LOAD_EACH_KIND=1: each kind alone at 32 clients first. The server is saturated, so 1/throughput
    // is what one request of that kind costs it, Next's own handling included (the bare route's).
    if (process.env.LOAD_EACH_KIND) {
      const alone: Record<string, { rps: number; msPerRequest: number; p95: number; errors: number }> = {};
      for (const [kind] of [["bare"], ...MIX]) {
        let drawn = 0;
        const one = (_seq: number, c: number, phase: string): LoadRequest => {
          if (kind === "bare") return { url: `${base}/api/ping` };
          let request: LoadRequest;
          do request = mixed(drawn++, c, `alone-${phase}`);
          while (request.kind !== kind);
          return request;
        };
        const [r] = await runInterleaved([target(32, one, 5_000)], 1);
        alone[kind] = { rps: r!.rps, msPerRequest: round(1000 / r!.rps, 2), p95: r!.latencyMs.p95, errors: r!.errors };
      }
      console.log("\n  each kind alone, 32 clients:");
      console.table(alone);
    }

    const phases: Record<string, { bare: LoadResult; mix: LoadResult }> = {};
    for (const clients of [32, 128]) {
      const [bare, mix] = await runInterleaved([target(clients, () => ({ url: `${base}/api/ping` })), target(clients, withProbe)], ROUNDS);
      phases[String(clients)] = { bare: bare!, mix: mix! };
      console.log(
        `\n  ${clients} clients: bare /api/ping p50/p95/p99 ${bare!.latencyMs.p50}/${bare!.latencyMs.p95}/${bare!.latencyMs.p99} ms, ${bare!.rps} req/s`,
      );
      console.table(
        Object.fromEntries([
          ...Object.entries(mix!.byKind).map(([k, v]) => [k, { ...v, share: `${round((100 * v.requests) / mix!.requests)} %` }]),
          [
            "all (mix)",
            {
              requests: mix!.requests,
              errors: mix!.errors,
              p50: mix!.latencyMs.p50,
              p95: mix!.latencyMs.p95,
              p99: mix!.latencyMs.p99,
              share: `${mix!.rps} req/s`,
            },
          ],
        ]),
      );
      if (mix!.errorSamples.length) console.log(`  errors: ${JSON.stringify(mix!.statuses)}; e.g. ${mix!.errorSamples.join(" | ")}`);
    }

    // The soak: the mix at 32 clients, resident memory sampled every 5 s.
    const pid = srv.server.pid;
    const samples: Array<[number, number]> = [];
    const t0 = performance.now();
    const sampler = setInterval(() => {
      const kb = statusKb(pid, "VmRSS");
      if (kb !== null) samples.push([(performance.now() - t0) / 60_000, kb / 1024]);
    }, SAMPLE_MS);
    const [soak] = await runInterleaved([target(32, mixed, soakMs)], 1);
    clearInterval(sampler);
    const settled = samples.filter(([min]) => min >= soakMs / 60_000 / 5);
    const rss = samples.map(([, mb]) => mb);
    const soakReport = {
      minutes: round(soakMs / 60_000, 1),
      requests: soak!.requests,
      errors: soak!.errors,
      rps: soak!.rps,
      rssFirstMb: round(rss[0] ?? NaN),
      rssLastMb: round(rss.at(-1) ?? NaN),
      rssMaxMb: round(Math.max(...rss)),
      slopeMbPerMinAfterFirstFifth: round(leastSquaresSlope(settled), 2),
      samples: samples.length,
    };
    console.log("\n  soak, 32 clients:");
    console.table({ soak: soakReport });
    const serviceAfter = await serviceTimes("service-after");
    console.log("\n  service time by kind (one client, sequential), after the soak:");
    console.table(serviceAfter);

    const board32 = phases["32"]!.mix.byKind.board!;
    const ratio = board32.p95 / phases["32"]!.bare.latencyMs.p95;
    const probe32 = phases["32"]!.mix.byKind["ping (inside the load)"];
    const queueRatio = probe32 ? board32.p95 / probe32.p95 : NaN;
    const errors128 = phases["128"]!.mix.errors + phases["128"]!.bare.errors;
    const goals = {
      boardP95OverBareAt32: round(ratio, 2),
      boardGoal: `≤ ${GOAL_RATIO}`,
      boardPass: ratio <= GOAL_RATIO,
      boardP95OverPingInsideTheLoadAt32: round(queueRatio, 2),
      errorsAt128: errors128,
      errorsPass: errors128 === 0,
    };
    console.log(
      `\n  board p95 at 32 clients: ${board32.p95} ms against bare ${phases["32"]!.bare.latencyMs.p95} ms = ${goals.boardP95OverBareAt32}× (goal ≤ ${GOAL_RATIO}×: ${goals.boardPass ? "PASS" : "MISS"}); against the bare route sent inside the same load ${probe32?.p95} ms = ${goals.boardP95OverPingInsideTheLoadAt32}× (the queue, not the board); errors at 128 clients: ${errors128} (goal 0: ${goals.errorsPass ? "PASS" : "MISS"})`,
    );
    return {
      mix: Object.fromEntries(MIX),
      phases: Object.fromEntries(
        Object.entries(phases).map(([k, v]) => [
          `${k} clients`,
          {
            bare: { ...v.bare.latencyMs, rps: v.bare.rps, errors: v.bare.errors },
            mix: { ...v.mix.latencyMs, rps: v.mix.rps, errors: v.mix.errors, errorSamples: v.mix.errorSamples, byKind: v.mix.byKind },
          },
        ]),
      ),
      serviceTime: service,
      serviceTimeAfterSoak: serviceAfter,
      soak: soakReport,
      goals,
      build: srv.build,
    };
  });
}
