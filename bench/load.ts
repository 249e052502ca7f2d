/**
 * A small closed-loop HTTP load generator (what autocannon does, without the dependency): N
 * clients, each with one request in flight at a time over keep-alive connections of one undici
 * Agent, for a fixed time after an untimed warm-up. Bounded in requests and time, loopback only.
 *
 * runInterleaved alternates several targets in rounds so that they share the machine's state.
 *
 * Latency is client side, from just before fetch() to the whole body read. A request counts as an
 * error when it throws (connection error, per-request timeout) or its status is not the expected
 * one; its latency is still recorded, so slow failures show in the percentiles.
 *
 * LOAD_TRACE=<file> appends one line per timed request (start time in ms since the epoch, clients,
 * kind, latency in ms, tab-separated), to see when in a run the slow requests happen.
 */
import fs from "node:fs";
import type { Dispatcher } from "undici-types";
import { percentile, round } from "./report";

const TRACE_FILE = process.env.LOAD_TRACE;

export interface LoadRequest {
  url: string;
  init?: RequestInit;
  /** A mixed workload names each request's kind; latencies and errors are then also kept per kind. */
  kind?: string;
  /** This request's expected status, when it differs from the target's. */
  expectStatus?: number;
}

export interface LoadOptions {
  /** Closed-loop clients (concurrent requests); the agent keeps at most this many connections. */
  connections: number;
  durationMs: number;
  warmupMs: number;
  /** Hard bound on the requests of the timed phase (and again of the warm-up). */
  maxRequests?: number;
  /** Per-request timeout; a request past it is aborted and counted as an error. */
  timeoutMs?: number;
  expectStatus: number;
  /** Builds request number `seq` (0, 1, … over the phase) of client `client`. */
  request: (seq: number, client: number, phase: "warmup" | "timed") => LoadRequest;
}

export interface LoadResult {
  requests: number;
  errors: number;
  statuses: Record<string, number>;
  errorSamples: string[];
  durationS: number;
  rps: number;
  latencyMs: { p50: number; p95: number; p99: number; mean: number; max: number; min: number };
  bytesPerResponse: number;
  /** The untimed warm-up: how many requests, with which statuses. */
  warmup: { requests: number; errors: number; statuses: Record<string, number> };
  /** Per kind of a mixed workload: requests, errors and latency percentiles. */
  byKind: Record<string, { requests: number; errors: number; p50: number; p95: number; p99: number }>;
}

const LOOPBACK = new Set(["localhost", "127.0.0.1", "[::1]"]);

type FetchInit = RequestInit & { dispatcher?: Dispatcher };

/**
 * undici's Agent as bundled with Node's fetch (Node ≥ 18 ships undici but does not export it): the
 * global dispatcher is one, created by the first fetch. Our own agent keeps the bench's
 * connections apart from any other fetch and caps their number.
 */
async function makeAgent(probeUrl: string, connections: number): Promise<Dispatcher | undefined> {
  await fetch(probeUrl)
    .then((r) => r.arrayBuffer())
    .catch(() => undefined);
  const global = (globalThis as Record<symbol, unknown>)[Symbol.for("undici.globalDispatcher.1")] as { constructor: new (o: object) => Dispatcher } | undefined;
  if (!global || global.constructor.name !== "Agent") return undefined; // fall back to the global dispatcher (also keep-alive)
  return new global.constructor({ connections, pipelining: 1, keepAliveTimeout: 30_000, keepAliveMaxTimeout: 60_000 });
}

interface Raw {
  kinds: Record<string, { latencies: number[]; errors: number }>;
  latencies: number[];
  statuses: Record<string, number>;
  errors: number;
  errorSamples: string[];
  bytes: number;
  elapsedMs: number;
}

/** One closed-loop slice of `durationMs`; `seq` numbers requests across the slices of one target. */
async function phase(opts: LoadOptions, agent: Dispatcher | undefined, durationMs: number, kind: "warmup" | "timed", counter: { seq: number }): Promise<Raw> {
  const latencies: number[] = [];
  const trace: string[] = [];
  const kinds: Raw["kinds"] = {};
  const statuses: Record<string, number> = {};
  const errorSamples: string[] = [];
  let errors = 0;
  let bytes = 0;
  let issued = 0;
  const max = opts.maxRequests ?? 200_000;
  const t0 = performance.now();
  const end = t0 + durationMs;
  const client = async (c: number) => {
    while (performance.now() < end && issued < max) {
      issued++;
      const { url, init, kind: requestKind, expectStatus } = opts.request(counter.seq++, c, kind);
      const expected = expectStatus ?? opts.expectStatus;
      const started = performance.now();
      let status = "error";
      let detail = "";
      try {
        const res = await fetch(url, { ...init, dispatcher: agent, signal: AbortSignal.timeout(opts.timeoutMs ?? 15_000) } as FetchInit);
        const body = await res.arrayBuffer();
        bytes += body.byteLength;
        status = String(res.status);
        if (res.status !== expected) detail = `${requestKind ? `${requestKind}: ` : ""}HTTP ${res.status}: ${Buffer.from(body).toString("utf8").slice(0, 200)}`;
      } catch (err) {
        detail = `${(err as Error).name}: ${(err as Error).message}`;
      }
      const ms = performance.now() - started;
      latencies.push(ms);
      if (TRACE_FILE && kind === "timed")
        trace.push(`${round(performance.timeOrigin + started, 1)}\t${opts.connections}\t${requestKind ?? "bare"}\t${round(ms, 2)}`);
      if (requestKind) {
        kinds[requestKind] ??= { latencies: [], errors: 0 };
        kinds[requestKind].latencies.push(ms);
        if (detail) kinds[requestKind].errors++;
      }
      statuses[status] = (statuses[status] ?? 0) + 1;
      if (detail) {
        errors++;
        if (errorSamples.length < 5) errorSamples.push(detail);
      }
    }
  };
  await Promise.all(Array.from({ length: opts.connections }, (_, c) => client(c)));
  if (trace.length) fs.appendFileSync(TRACE_FILE!, trace.join("\n") + "\n");
  return { kinds, latencies, statuses, errors, errorSamples, bytes, elapsedMs: performance.now() - t0 };
}

function merge(raws: Raw[]): Raw {
  const statuses: Record<string, number> = {};
  for (const r of raws) for (const [k, v] of Object.entries(r.statuses)) statuses[k] = (statuses[k] ?? 0) + v;
  const kinds: Raw["kinds"] = {};
  for (const r of raws)
    for (const [k, v] of Object.entries(r.kinds)) {
      kinds[k] ??= { latencies: [], errors: 0 };
      kinds[k].latencies.push(...v.latencies);
      kinds[k].errors += v.errors;
    }
  return {
    kinds,
    latencies: raws.flatMap((r) => r.latencies),
    statuses,
    errors: raws.reduce((a, r) => a + r.errors, 0),
    errorSamples: raws.flatMap((r) => r.errorSamples).slice(0, 5),
    bytes: raws.reduce((a, r) => a + r.bytes, 0),
    elapsedMs: raws.reduce((a, r) => a + r.elapsedMs, 0),
  };
}

function summarize(r: Raw, w: Raw | null): LoadResult {
  const l = r.latencies;
  const n = l.length;
  return {
    requests: n,
    errors: r.errors,
    statuses: r.statuses,
    errorSamples: r.errorSamples,
    durationS: round(r.elapsedMs / 1000, 2),
    rps: round(n / (r.elapsedMs / 1000)),
    latencyMs: n
      ? {
          p50: round(percentile(l, 50), 2),
          p95: round(percentile(l, 95), 2),
          p99: round(percentile(l, 99), 2),
          mean: round(l.reduce((a, b) => a + b, 0) / n, 2),
          max: round(
            l.reduce((a, b) => Math.max(a, b), 0),
            2,
          ),
          min: round(
            l.reduce((a, b) => Math.min(a, b), Infinity),
            2,
          ),
        }
      : { p50: NaN, p95: NaN, p99: NaN, mean: NaN, max: NaN, min: NaN },
    bytesPerResponse: n ? Math.round(r.bytes / n) : 0,
    warmup: { requests: w?.latencies.length ?? 0, errors: w?.errors ?? 0, statuses: w?.statuses ?? {} },
    byKind: Object.fromEntries(
      Object.entries(r.kinds).map(([k, v]) => [
        k,
        {
          requests: v.latencies.length,
          errors: v.errors,
          p50: round(percentile(v.latencies, 50), 2),
          p95: round(percentile(v.latencies, 95), 2),
          p99: round(percentile(v.latencies, 99), 2),
        },
      ]),
    ),
  };
}

/**
 * Several targets measured in alternation: each warms up once, then `rounds` rounds run every
 * target for durationMs / rounds in turn, so that other work on the machine weighs on all of them
 * alike. `around` is called before and after each timed slice (e.g. to read the server's CPU time).
 */
export async function runInterleaved(
  targets: LoadOptions[],
  rounds: number,
  around?: (target: number, when: "before" | "after") => void,
): Promise<LoadResult[]> {
  const agents: Array<Dispatcher | undefined> = [];
  try {
    for (const t of targets) {
      const first = new URL(t.request(0, 0, "warmup").url);
      if (!LOOPBACK.has(first.hostname)) throw new Error(`the load generator only targets loopback, not ${first.hostname}`);
      agents.push(await makeAgent(`${first.origin}/api/ping`, t.connections));
    }
    const counters = targets.map(() => ({ seq: 0 }));
    const warm: Array<Raw | null> = [];
    for (const [i, t] of targets.entries()) warm.push(t.warmupMs > 0 ? await phase(t, agents[i], t.warmupMs, "warmup", counters[i]!) : null);
    const timed: Raw[][] = targets.map(() => []);
    for (let r = 0; r < rounds; r++) {
      for (const [i, t] of targets.entries()) {
        around?.(i, "before");
        timed[i]!.push(await phase(t, agents[i], t.durationMs / rounds, "timed", counters[i]!));
        around?.(i, "after");
      }
    }
    return targets.map((_, i) => summarize(merge(timed[i]!), warm[i]!));
  } finally {
    await Promise.all(agents.map((a) => a?.close()));
  }
}

/** One target: warm-up (results dropped), then the timed phase. */
export async function runLoad(opts: LoadOptions): Promise<LoadResult> {
  return (await runInterleaved([opts], 1))[0]!;
}
