/**
 * Ingest end to end: the 1,000,000 × 3 numeric CSV (about 24 MB) through the real HTTP API of a
 * production build (`next start`) on a throw-away database, beside the bare parser figures of
 * the same run (ours, PapaParse, uDSV).
 *
 * - Uploads: 3 × POST /api/manuscripts/demo-manuscript/datasets, each a new dataset with one
 *   digit changed so that no two bodies hash alike. The multipart body is built here and
 *   streamed from the file (1 MiB reads, Content-Length set), so the client never holds the file
 *   in memory; a tiny upload first loads the route (not timed). Wall time is client side, from
 *   the request to the parsed 201 response.
 * - Memory: VmRSS of the next-server process every 20 ms during the uploads; its VmHWM (peak) is
 *   reset just before them (/proc/<pid>/clear_refs ← 5), so the high-water mark is exact. The goal
 *   is on what the uploads add to the idle server (peak above idle ≤ 3 × the file). The file is
 *   parsed in the ingest child, a separate process: its own peak (VmHWM) is printed beside it.
 * - Rows: GET /api/versions/{id}/rows?offset=900000&limit=1000, 3 warm-ups then 50 timed.
 *
 * Ports: 3400 (app) and 2828 (mail sink). The server's life (build if stale, throw-away database,
 * shared build lock, stop) is in bench-server.ts; the /proc readings in proc-stats.ts.
 */
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { Readable } from "node:stream";
import { withBenchServer } from "./bench-server";
import { benchParse, makeNumericCsv } from "./ingest-parse";
import { processGroup, RssSampler, statusKb } from "./proc-stats";
import { median, percentile, printTable, round } from "./report";

const APP_PORT = 3400;
const SMTP_PORT = 2828;
const BASE = `http://localhost:${APP_PORT}`;
const ROWS = 1_000_000;
const COLS = 3;
const SEED = 42;
const UPLOADS = 3;
const ROW_WARMUPS = 3;
const ROW_REQUESTS = 50;
const SAMPLE_MS = 20;

const GOALS = { rssFactor: 5, aboveIdleFactor: 3, rowsMedianMs: 30 };

// ---------------------------------------------------------------------------------------------
// HTTP

/** A multipart/form-data body streamed from a file: the fields, then the file in 1 MiB reads. */
function multipartFromFile(file: string, fileName: string, fields: Record<string, string>) {
  const boundary = `----prooflight-bench-${randomBytes(12).toString("hex")}`;
  const fieldParts = Object.entries(fields)
    .map(([k, v]) => `--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`)
    .join("");
  const head = Buffer.from(
    `${fieldParts}--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${fileName}"\r\nContent-Type: text/csv\r\n\r\n`,
  );
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
  const length = head.length + fs.statSync(file).size + tail.length;
  async function* parts() {
    yield head;
    for await (const chunk of fs.createReadStream(file, { highWaterMark: 1 << 20 })) yield chunk as Buffer;
    yield tail;
  }
  return {
    contentType: `multipart/form-data; boundary=${boundary}`,
    length,
    body: Readable.toWeb(Readable.from(parts(), { objectMode: false })) as ReadableStream<Uint8Array>,
  };
}

async function upload(token: string, file: string, fileName: string, name: string) {
  const mp = multipartFromFile(file, fileName, { name });
  const init: RequestInit & { duplex: "half" } = {
    method: "POST",
    headers: { authorization: `Bearer ${token}`, "content-type": mp.contentType, "content-length": String(mp.length) },
    body: mp.body,
    duplex: "half",
  };
  const t0 = performance.now();
  const res = await fetch(`${BASE}/api/manuscripts/demo-manuscript/datasets`, init);
  const text = await res.text();
  const ms = performance.now() - t0;
  if (res.status !== 201) throw new Error(`upload of ${fileName}: HTTP ${res.status} (expected 201): ${text.slice(0, 500)}`);
  const version = JSON.parse(text) as { id: string; rowCount: number; byteSize: number; sha256: string };
  return { ms, status: res.status, version };
}

async function timedGet(token: string, url: string): Promise<{ ms: number; body: unknown }> {
  const t0 = performance.now();
  const res = await fetch(url, { headers: { authorization: `Bearer ${token}` } });
  const text = await res.text();
  const ms = performance.now() - t0;
  if (!res.ok) throw new Error(`GET ${url}: HTTP ${res.status}: ${text.slice(0, 300)}`);
  return { ms, body: JSON.parse(text) };
}

function cmdlineOf(pid: number): string {
  try {
    return fs.readFileSync(`/proc/${pid}/cmdline`, "utf8");
  } catch {
    return ""; // gone since the listing
  }
}

/** The ingest children of the server (forked with ingest-child.ts) and the largest VmHWM among them, kB. */
function ingestChildPeakKb(serverPid: number, groupPid: number): number | null {
  const peaks = processGroup(groupPid)
    .filter((p) => p.ppid === serverPid && cmdlineOf(p.pid).includes("ingest-child"))
    .map((p) => statusKb(p.pid, "VmHWM") ?? 0);
  return peaks.length ? Math.max(...peaks) : null;
}

// ---------------------------------------------------------------------------------------------

/** Copies of the CSV with the last digit of the file changed (k = 0, 1, 2 → three distinct digits). */
function writeVariants(dir: string, bytes: Uint8Array, count: number): string[] {
  let at = bytes.length - 1;
  while (at >= 0 && !(bytes[at]! >= 48 && bytes[at]! <= 57)) at--;
  const digit = bytes[at]! - 48;
  return Array.from({ length: count }, (_, k) => {
    const file = path.join(dir, `bench-1m-x3-${k + 1}.csv`);
    fs.writeFileSync(file, bytes);
    const fd = fs.openSync(file, "r+");
    fs.writeSync(fd, Buffer.from([48 + ((digit + k + 1) % 10)]), 0, 1, at);
    fs.closeSync(fd);
    return file;
  });
}

export async function benchIngest(): Promise<Record<string, unknown>> {
  const bytes = makeNumericCsv(ROWS, COLS, SEED);
  const fileBytes = bytes.length;
  const fileMB = fileBytes / 1e6;
  console.log(`  file: ${ROWS.toLocaleString("en")} rows × ${COLS} columns, ${fileMB.toFixed(2)} MB`);

  // Parser anchors first, while nothing else runs.
  const parse = await benchParse(bytes);

  return withBenchServer(
    { appPort: APP_PORT, smtpPort: SMTP_PORT, tokensFor: ["author@lab.example.org"] },
    async ({ dir, tokens, server: srv, groupPid, build, readyMs: startMs }) => {
      const token = tokens["author@lab.example.org"]!;
      const files = writeVariants(dir, bytes, UPLOADS);

      // Load the upload route once with a tiny file (not timed).
      const tiny = path.join(dir, "warmup.csv");
      fs.writeFileSync(tiny, "t_us,signal_1\n0,1\n1,2\n");
      await upload(token, tiny, "warmup.csv", "bench warm-up");

      const idleRssKb = statusKb(srv.pid, "VmRSS") ?? 0;
      const startupHwmKb = statusKb(srv.pid, "VmHWM") ?? 0;
      // Resetting the high-water mark before each upload gives each upload's exact peak.
      const resetHwm = () => {
        try {
          fs.writeFileSync(`/proc/${srv.pid}/clear_refs`, "5");
          return true;
        } catch {
          return false;
        }
      };
      const hwmReset = resetHwm(); // when not permitted, VmHWM includes start-up and the sampler is the measure
      const sampler = new RssSampler(srv.pid, SAMPLE_MS);
      sampler.start();
      const uploads: Array<{
        ms: number;
        MBps: number;
        peakRssKb: number | null;
        rssAfterKb: number | null;
        childPeakRssKb: number | null;
        versionId: string;
        rowCount: number;
      }> = [];
      for (const [k, file] of files.entries()) {
        if (hwmReset) resetHwm();
        const r = await upload(token, file, path.basename(file), `bench upload ${k + 1}`);
        if (r.version.rowCount !== ROWS || r.version.byteSize !== fileBytes) {
          throw new Error(`upload ${k + 1}: stored ${r.version.rowCount} rows / ${r.version.byteSize} bytes, expected ${ROWS} / ${fileBytes}`);
        }
        uploads.push({
          ms: round(r.ms),
          MBps: round(fileMB / (r.ms / 1000)),
          peakRssKb: hwmReset ? statusKb(srv.pid, "VmHWM") : null,
          rssAfterKb: statusKb(srv.pid, "VmRSS"),
          childPeakRssKb: ingestChildPeakKb(srv.pid, groupPid),
          versionId: r.version.id,
          rowCount: r.version.rowCount,
        });
      }
      sampler.stop();
      const uploadHwmKb = hwmReset ? Math.max(...uploads.map((u) => u.peakRssKb ?? 0)) : 0;
      const afterUploadsRssKb = statusKb(srv.pid, "VmRSS") ?? 0;

      const rowsUrl = `${BASE}/api/versions/${uploads[uploads.length - 1]!.versionId}/rows?offset=900000&limit=1000`;
      for (let i = 0; i < ROW_WARMUPS; i++) {
        const { body } = await timedGet(token, rowsUrl);
        const page = body as { offset: number; rows: unknown[] };
        if (i === 0 && (page.offset !== 900000 || page.rows.length !== 1000)) throw new Error(`rows page: offset ${page.offset}, ${page.rows.length} rows`);
      }
      const rowTimes: number[] = [];
      for (let i = 0; i < ROW_REQUESTS; i++) rowTimes.push((await timedGet(token, rowsUrl)).ms);
      // With the resets, the process's lifetime peak is the largest of the pieces.
      const lifetimeHwmKb = Math.max(startupHwmKb, uploadHwmKb, statusKb(srv.pid, "VmHWM") ?? 0);

      const mark = (p: boolean) => (p ? "PASS" : "MISS");
      const MiB = (kb: number) => `${(kb / 1024).toFixed(0)} MiB`;
      const uploadMedianMs = median(uploads.map((u) => u.ms));
      const e2eMBps = fileMB / (uploadMedianMs / 1000);
      const peakRssKb = Math.max(sampler.peakKb, hwmReset ? uploadHwmKb : 0);
      const rssRatio = (peakRssKb * 1024) / fileBytes;
      const rowsMedian = median(rowTimes);
      const rowsP95 = percentile(rowTimes, 95);
      // The idle server alone is about 6 × this file, so the total (peakRss) cannot be met as
      // written; the goal that counts is on what the uploads add to it (peakAboveIdle).
      const aboveIdleRatio = ((peakRssKb - idleRssKb) * 1024) / fileBytes;
      const goals = {
        e2eVsPapaBare: {
          goal: `≥ ${parse.papaparse_bare_MBps!.toFixed(1)} MB/s (PapaParse bare)`,
          value: round(e2eMBps),
          pass: e2eMBps >= parse.papaparse_bare_MBps!,
        },
        peakRss: {
          goal: `< ${GOALS.rssFactor} × file = ${((GOALS.rssFactor * fileBytes) / 1048576).toFixed(0)} MiB`,
          value: round(rssRatio, 2),
          pass: rssRatio < GOALS.rssFactor,
        },
        peakAboveIdle: {
          goal: `≤ ${GOALS.aboveIdleFactor} × file above idle`,
          value: round(aboveIdleRatio, 2),
          pass: aboveIdleRatio <= GOALS.aboveIdleFactor,
        },
        rowsMedian: { goal: `< ${GOALS.rowsMedianMs} ms`, value: round(rowsMedian, 2), pass: rowsMedian < GOALS.rowsMedianMs },
      };
      const childPeaks = uploads.map((u) => u.childPeakRssKb).filter((kb): kb is number => kb !== null);
      const childPeakKb = childPeaks.length ? Math.max(...childPeaks) : null;

      console.log();
      printTable([
        ["ingest (1M × 3 CSV)", "value", "goal", ""],
        ["file", `${fileMB.toFixed(2)} MB`, "", ""],
        ["parse: Prooflight", `${parse.prooflight_MBps!.toFixed(1)} MB/s (${parse.prooflight_ms!.toFixed(0)} ms)`, "", ""],
        ["parse: PapaParse (decode + parse)", `${parse.papaparse_MBps!.toFixed(1)} MB/s (${parse.papaparse_ms!.toFixed(0)} ms)`, "", ""],
        ["parse: PapaParse bare (string)", `${parse.papaparse_bare_MBps!.toFixed(1)} MB/s (${parse.papaparse_bare_ms!.toFixed(0)} ms)`, "", ""],
        ["parse: uDSV", `${parse.udsv_MBps!.toFixed(1)} MB/s (${parse.udsv_ms!.toFixed(0)} ms)`, "", ""],
        ...uploads.map((u, i) => [
          `upload ${i + 1} (HTTP, streamed multipart)`,
          `${u.MBps.toFixed(1)} MB/s (${u.ms.toFixed(0)} ms)${u.peakRssKb ? `, RSS peak ${MiB(u.peakRssKb)} → ${MiB(u.rssAfterKb ?? 0)}` : ""}`,
          "",
          "",
        ]),
        ["upload median, end to end", `${e2eMBps.toFixed(1)} MB/s (${uploadMedianMs.toFixed(0)} ms)`, goals.e2eVsPapaBare.goal, mark(goals.e2eVsPapaBare.pass)],
        ["server RSS idle before uploads", MiB(idleRssKb), "", ""],
        [
          `server peak RSS during uploads (${hwmReset ? "VmHWM, reset per upload" : `${sampler.samples} samples`})`,
          `${MiB(peakRssKb)} = ${rssRatio.toFixed(2)} × file`,
          goals.peakRss.goal,
          mark(goals.peakRss.pass),
        ],
        ["  sampled max VmRSS (20 ms)", `${MiB(sampler.peakKb)} (${sampler.samples} samples)`, "", ""],
        ["  peak above idle", `${MiB(peakRssKb - idleRssKb)} = ${aboveIdleRatio.toFixed(2)} × file`, goals.peakAboveIdle.goal, mark(goals.peakAboveIdle.pass)],
        ["ingest child peak RSS (separate process, VmHWM)", childPeakKb === null ? "no ingest child seen" : MiB(childPeakKb), "", ""],
        ["  RSS after uploads", MiB(afterUploadsRssKb), "", ""],
        ["  VmHWM at end (process lifetime)", `${MiB(lifetimeHwmKb)} (start-up ${MiB(startupHwmKb)})`, "", ""],
        [
          `rows offset 900000 limit 1000 (n=${ROW_REQUESTS})`,
          `median ${rowsMedian.toFixed(2)} ms, p95 ${rowsP95.toFixed(2)} ms`,
          goals.rowsMedian.goal,
          mark(goals.rowsMedian.pass),
        ],
      ]);
      console.log(
        `  server: pid ${srv.pid} (${srv.comm}), group ${groupPid}: ${srv.group.map((p) => `${p.pid} ${p.comm}`).join(", ")}; build ${build}; ready in ${(startMs / 1000).toFixed(1)} s`,
      );

      return {
        file: { rows: ROWS, cols: COLS, seed: SEED, bytes: fileBytes, megabytes: round(fileMB, 3) },
        parse: Object.fromEntries(Object.entries(parse).map(([k, v]) => [k, round(v, 2)])),
        upload: {
          method: "multipart/form-data built by the bench, streamed from the file in 1 MiB reads (Content-Length set); 1 untimed warm-up upload of a tiny file",
          runs: uploads,
          medianMs: round(uploadMedianMs),
          medianMBps: round(e2eMBps, 2),
        },
        memory: {
          serverPid: srv.pid,
          serverComm: srv.comm,
          sampleIntervalMs: SAMPLE_MS,
          samples: sampler.samples,
          idleRssKb,
          sampledPeakRssKb: sampler.peakKb,
          hwmResetBeforeUploads: hwmReset,
          uploadHwmKb,
          peakRssKb,
          peakToFileRatio: round(rssRatio, 2),
          peakAboveIdleToFileRatio: round(aboveIdleRatio, 2),
          afterUploadsRssKb,
          startupHwmKb,
          lifetimeHwmKb,
          ingestChildPeakRssKb: childPeakKb,
        },
        rows: {
          url: "/api/versions/{id}/rows?offset=900000&limit=1000",
          warmups: ROW_WARMUPS,
          requests: ROW_REQUESTS,
          medianMs: round(rowsMedian, 2),
          p95Ms: round(rowsP95, 2),
          minMs: round(Math.min(...rowTimes), 2),
          maxMs: round(Math.max(...rowTimes), 2),
        },
        goals,
        serverReadyMs: Math.round(startMs),
        build,
      };
    },
  );
}
