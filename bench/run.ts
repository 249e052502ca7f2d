/**
 * `npm run bench [-- <name>...]`: runs the named benchmarks (default: all), prints a table per
 * benchmark and writes bench/results/<name>.json plus bench/results/latest.json, which keeps the
 * results of benchmarks not run this time.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { benchExport } from "./export";
import { benchFit } from "./fit";
import { benchIngest } from "./ingest";
import { benchLoadMix } from "./load-mix";
import { benchMail } from "./mail";
import { benchRender } from "./render";
import { benchReview } from "./review";
import { benchServiceCost } from "./service-cost";

const BENCHMARKS: Record<string, { what: string; run: () => Promise<Record<string, unknown>> }> = {
  fit: { what: "fitter throughput (one core)", run: benchFit },
  ingest: { what: "1M × 3 CSV: parsers, upload through the HTTP API, server memory, row paging", run: benchIngest },
  render: { what: "server SVG vs bare Vega, 1M-point display series, two-panel figure PDF", run: benchRender },
  review: { what: "board read and comment post, 32 concurrent clients, against a fixed-JSON route", run: benchReview },
  export: {
    what: "xlsx source data, bundle and bundle check of the demo figure and of figures bound to 10k, 100k and 1M rows: time and peak memory",
    run: benchExport,
  },
  load: { what: "mixed workload (board, rows, queue, comments, decisions) at 32 and 128 clients beside a bare route, then a memory soak", run: benchLoadMix },
  "service-cost": { what: "CPU, wall time and SQL statements per request of each load-mix kind, route handlers in process (no HTTP)", run: benchServiceCost },
  mail: { what: "digests for 1,000 people on 20 manuscripts after a month of activity: build, draw, send", run: benchMail },
};

const resultsDir = path.join(process.cwd(), "bench", "results");
const latestFile = path.join(resultsDir, "latest.json");

const requested = process.argv.slice(2).filter((a) => a !== "--");
const unknown = requested.filter((n) => !(n in BENCHMARKS));
if (unknown.length) {
  console.error(`Unknown benchmark${unknown.length > 1 ? "s" : ""}: ${unknown.join(", ")}. Known: ${Object.keys(BENCHMARKS).join(", ")}.`);
  process.exit(2);
}
const names = requested.length ? [...new Set(requested)] : Object.keys(BENCHMARKS);

const machine = { date: new Date().toISOString(), node: process.version, cpu: os.cpus()[0]?.model ?? "unknown" };
const load = () =>
  os
    .loadavg()
    .map((l) => l.toFixed(2))
    .join(" ");
console.log(`Node ${machine.node} · ${machine.cpu} · ${os.cpus().length} cores · ${(os.totalmem() / 2 ** 30).toFixed(1)} GiB · load ${load()}`);

fs.mkdirSync(resultsDir, { recursive: true });
const results: Record<string, unknown> = {};
let failed = 0;
for (const name of names) {
  const bench = BENCHMARKS[name]!;
  console.log(`\n== ${name}: ${bench.what}`);
  const t0 = performance.now();
  try {
    results[name] = await bench.run();
  } catch (err) {
    failed++;
    console.error(`✕ ${name} failed: ${(err as Error).stack ?? err}`);
    continue;
  }
  // Other work on the machine skews timings; the load average after each benchmark says how much.
  const loadAfter = load();
  console.log(`   (${name}: ${((performance.now() - t0) / 1000).toFixed(1)} s; load average ${loadAfter})`);
  fs.writeFileSync(path.join(resultsDir, `${name}.json`), `${JSON.stringify({ ...machine, loadAverageAfter: loadAfter, result: results[name] }, null, 2)}\n`);
}

if (Object.keys(results).length) {
  let previous: { results?: Record<string, unknown> } = {};
  try {
    previous = JSON.parse(fs.readFileSync(latestFile, "utf8"));
  } catch {
    /* first run, or unreadable: start afresh */
  }
  const latest = { ...machine, results: { ...(previous.results ?? {}), ...results } };
  fs.writeFileSync(latestFile, `${JSON.stringify(latest, null, 2)}\n`);
  console.log(`\nWrote ${path.relative(process.cwd(), latestFile)} (${Object.keys(results).join(", ")} updated)`);
}
process.exit(failed ? 1 : 0);
