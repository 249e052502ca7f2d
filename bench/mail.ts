/**
 * Digests at scale: 1,000 people on 20 manuscripts (two each, about 100 members per manuscript)
 * with a month of activity (per manuscript and day: 2 comments, 1 decision, a new revision every
 * third day, a new data version every fifth), everyone's last digest a month ago. Times building and
 * enqueueing every digest (runDigests), then drawing the HTML (render child) and sending it all
 * through the local SMTP sink (deliverOutbox). The median per digest is the gap between successive
 * digests being built, which includes the previous one's transaction. Peak RSS is this process's
 * VmHWM (the render child is a separate process, reported beside it when it can be read).
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Role } from "@/db/schema";
import { statusKb } from "./proc-stats";
import { median, printTable, round } from "./report";

const USERS = 1000;
const MANUSCRIPTS = 20;
const DAYS = 30;
const NOW = new Date("2026-03-02T09:00:00Z"); // a Monday; the default digest is due at 08:00 UTC
const DAY = 86_400_000;
const START = NOW.getTime() - 8 * 3_600_000 - 1 - DAYS * DAY;

/** A small deterministic generator, so every run seeds the same month. */
function rng(seed: number) {
  let s = seed >>> 0;
  return () => {
    s = (s * 1_664_525 + 1_013_904_223) >>> 0;
    return s / 2 ** 32;
  };
}

async function insertAll<T>(rows: T[], insert: (chunk: T[]) => Promise<unknown>) {
  for (let i = 0; i < rows.length; i += 400) await insert(rows.slice(i, i + 400));
}

export async function benchMail(): Promise<Record<string, unknown>> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-bench-mail-"));
  Object.assign(process.env, {
    DATABASE_URL: `file:${path.join(dir, "bench.db")}`,
    UPLOADS_DIR: path.join(dir, "uploads"),
    MAIL_SINK_DIR: path.join(dir, "mail"),
    AUTH_SECRET: "bench-secret-bench-secret-bench-secret-01",
    SMTP_PORT: String(30_000 + Math.floor(Math.random() * 20_000)),
  });
  delete process.env.SMTP_URL;
  (await import("@/lib/env")).resetEnvForTests();
  const { closeDb, getDb } = await import("@/db/client");
  closeDb();
  const { applyMigrations } = await import("@/db/migrate");
  await applyMigrations();
  const s = await import("@/db/schema");
  const { runDigests } = await import("@/lib/server/mail/digests");
  const { deliverOutbox, drawPendingHtml } = await import("@/lib/server/mail/outbox");
  const { startMailSink } = await import("@/lib/server/mail/sink-server");
  const { env } = await import("@/lib/env");
  const db = getDb();
  const rand = rng(42);
  const pick = <T>(xs: T[]) => xs[Math.floor(rand() * xs.length)]!;
  const at = (day: number) => new Date(START + day * DAY + Math.floor(rand() * DAY));

  // People, manuscripts and members.
  const t0 = performance.now();
  await db.insert(s.labs).values({ id: "lab", name: "Bench lab" });
  const users = Array.from({ length: USERS }, (_, i) => ({ id: `u${i}`, email: `person${i}@bench.example.org`, name: `Person ${i}` }));
  await insertAll(users, (c) => db.insert(s.users).values(c));
  const manuscripts = Array.from({ length: MANUSCRIPTS }, (_, m) => ({
    id: `m${m}`,
    labId: "lab",
    title: `Bench manuscript ${m}: spin coherence study`,
    createdBy: `u${m}`,
  }));
  await db.insert(s.manuscripts).values(manuscripts);
  const members = new Map<string, Array<{ userId: string; role: Role }>>();
  for (let i = 0; i < USERS; i++)
    for (const m of new Set([i % MANUSCRIPTS, (i * 7 + 3) % MANUSCRIPTS])) {
      const list = members.get(`m${m}`) ?? [];
      const role: Role = i < MANUSCRIPTS && m === i ? "pi" : pick(["author", "author", "reviewer", "reviewer", "viewer"] as const);
      list.push({ userId: `u${i}`, role });
      members.set(`m${m}`, list);
    }
  await insertAll(
    [...members].flatMap(([manuscriptId, list]) => list.map((x) => ({ manuscriptId, ...x }))),
    (c) => db.insert(s.manuscriptMembers).values(c),
  );

  // Per manuscript: 6 datasets, 4 figures of 3 panels, a thread per panel; then a month of events.
  const versionRows: Array<typeof s.versions.$inferInsert> = [];
  const revisionRows: Array<typeof s.revisions.$inferInsert> = [];
  const commentRows: Array<typeof s.comments.$inferInsert> = [];
  const decisionRows: Array<typeof s.decisions.$inferInsert> = [];
  const threadRows: Array<typeof s.threads.$inferInsert> = [];
  let counts = { comments: 0, decisions: 0, revisions: 0, versions: 0 };
  for (const ms of manuscripts) {
    const people = members.get(ms.id)!;
    const writers = people.filter((p) => p.role !== "viewer").map((p) => p.userId);
    const reviewers = people.filter((p) => p.role === "reviewer").map((p) => p.userId);
    const datasets = Array.from({ length: 6 }, (_, d) => ({
      id: `${ms.id}-d${d}`,
      manuscriptId: ms.id,
      name: `Scan ${d}`,
      createdBy: pick(writers),
      createdAt: new Date(START - DAY),
    }));
    await db.insert(s.datasets).values(datasets);
    const latest = new Map<string, { id: string; number: number }>();
    const version = (datasetId: string, number: number, when: Date) => {
      const id = `${datasetId}-v${number}`;
      versionRows.push({
        id,
        datasetId,
        number,
        sha256: id.padEnd(64, "0"),
        byteSize: 1000,
        fileName: `${datasetId}.csv`,
        rowCount: 10,
        columns: [],
        parseInfo: { format: "csv", encoding: "utf-8", delimiter: ",", decimal: ".", warnings: [], headerMetadata: {} },
        createdBy: pick(writers),
        createdAt: when,
      });
      latest.set(datasetId, { id, number });
    };
    for (const d of datasets) version(d.id, 1, new Date(START - DAY));
    const figures = Array.from({ length: 4 }, (_, f) => ({
      id: `${ms.id}-f${f}`,
      manuscriptId: ms.id,
      number: f + 1,
      title: `Figure ${f + 1} of ${ms.id}`,
      createdBy: pick(writers),
    }));
    await db.insert(s.figures).values(figures);
    const panels = figures.flatMap((f) =>
      [0, 1, 2].map((p) => ({ id: `${f.id}-p${p}`, figureId: f.id, position: p, title: `Panel ${p}`, createdBy: pick(writers) })),
    );
    const revNo = new Map<string, number>();
    const current = new Map<string, { id: string; hash: string }>();
    const revise = (panelId: string, when: Date) => {
      const n = (revNo.get(panelId) ?? 0) + 1;
      revNo.set(panelId, n);
      const d = latest.get(`${ms.id}-d${Number(panelId.slice(-1)) % 6}`)!;
      const id = `${panelId}-r${n}`;
      revisionRows.push({
        id,
        panelId,
        number: n,
        spec: "{}",
        bindings: { data: { versionId: d.id } },
        bound: { data: { kind: "version", id: d.id, versionId: d.id, sha256: d.id } },
        contentHash: `hash-${id}`,
        createdBy: pick(writers),
        createdAt: when,
      });
      current.set(panelId, { id, hash: `hash-${id}` });
    };
    for (const p of panels) revise(p.id, new Date(START - DAY));
    const threads = panels.map((p) => ({
      id: `${p.id}-t`,
      panelId: p.id,
      revisionId: current.get(p.id)!.id,
      createdBy: pick(writers),
      createdAt: new Date(START - DAY),
    }));
    for (let day = 0; day < DAYS; day++) {
      for (let k = 0; k < 2; k++) {
        const t = pick(threads);
        commentRows.push({
          id: `c${commentRows.length}`,
          threadId: t.id,
          body: {},
          html: `<p>Comment ${commentRows.length}: is the σ on point ${k} from the fit &amp; scaled?</p>`,
          createdBy: pick(writers),
          createdAt: at(day),
        });
      }
      const p = pick(panels);
      const c = current.get(p.id)!;
      decisionRows.push({
        id: `d${decisionRows.length}`,
        panelId: p.id,
        revisionId: c.id,
        contentHash: c.hash,
        decision: rand() < 0.7 ? "approved" : "needs_revision",
        note: "",
        userId: reviewers.length ? pick(reviewers) : pick(writers),
        createdAt: at(day),
      });
      if (day % 5 === 2) {
        const d = pick(datasets);
        version(d.id, latest.get(d.id)!.number + 1, at(day));
      }
      if (day % 3 === 1) revise(pick(panels).id, at(day));
    }
    await db.insert(s.panels).values(panels.map((p) => ({ ...p, currentRevisionId: current.get(p.id)!.id })));
    threadRows.push(...threads);
  }
  await insertAll(versionRows, (c) => db.insert(s.versions).values(c));
  await insertAll(revisionRows, (c) => db.insert(s.revisions).values(c));
  await insertAll(threadRows, (c) => db.insert(s.threads).values(c));
  await insertAll(commentRows, (c) => db.insert(s.comments).values(c));
  await insertAll(decisionRows, (c) => db.insert(s.decisions).values(c));
  counts = { comments: commentRows.length, decisions: decisionRows.length, revisions: revisionRows.length, versions: versionRows.length };
  // Everyone's last digest was a month ago: this one covers the whole month.
  await insertAll(
    users.map((u) => ({ id: `run-${u.id}`, userId: u.id, periodStart: new Date(START), since: new Date(START - DAY), items: 0 })),
    (c) => db.insert(s.digestRuns).values(c),
  );
  const seedMs = performance.now() - t0;

  // Build and enqueue every digest; the gaps between successive builds give the per-digest cost.
  const marks: number[] = [];
  const t1 = performance.now();
  const built = await runDigests(NOW, {
    afterBuild: async () => {
      marks.push(performance.now());
    },
  });
  const buildMs = performance.now() - t1;
  const perDigest = marks.slice(1).map((m, i) => m - marks[i]!);
  const outbox = await db.select({ text: s.mailOutbox.text }).from(s.mailOutbox);
  const lines = outbox.map((o) => (o.text.match(/^- /gm) ?? []).length);

  // Draw the HTML and send everything through the local sink.
  const sink = await startMailSink({ port: env().smtpPort, dir: env().mailSinkDir, quiet: true });
  const t2 = performance.now();
  await drawPendingHtml();
  const drawMs = performance.now() - t2;
  let delivered = 0;
  for (;;) {
    const n = await deliverOutbox();
    delivered += n;
    if (!n) break;
  }
  const sendMs = performance.now() - t2;
  await sink.close();
  const htmlBytes = (await db.select({ html: s.mailOutbox.html }).from(s.mailOutbox)).map((r) => r.html?.length ?? 0);
  closeDb();
  fs.rmSync(dir, { recursive: true, force: true });

  const result = {
    users: USERS,
    manuscripts: MANUSCRIPTS,
    activity: counts,
    digests: built,
    linesPerDigest: { median: median(lines), max: Math.max(...lines) },
    htmlKbPerDigest: round(median(htmlBytes) / 1024),
    seedSeconds: round(seedMs / 1000),
    buildSeconds: round(buildMs / 1000),
    medianMsPerDigest: round(median(perDigest)),
    drawSeconds: round(drawMs / 1000),
    drawAndSendSeconds: round(sendMs / 1000),
    delivered,
    totalSeconds: round((buildMs + sendMs) / 1000),
    peakRssMb: round((statusKb(process.pid, "VmHWM") ?? 0) / 1024),
  };
  printTable([
    ["what", "value"],
    ["digests enqueued / empty", `${built.sent} / ${built.empty}`],
    ["lines per digest (median / max)", `${result.linesPerDigest.median} / ${result.linesPerDigest.max}`],
    ["build + enqueue, s", result.buildSeconds],
    ["median per digest, ms", result.medianMsPerDigest],
    ["of which drawing HTML (react-email), s", result.drawSeconds],
    ["draw HTML + send via sink, s", result.drawAndSendSeconds],
    ["total, s", result.totalSeconds],
    ["peak RSS (this process), MB", result.peakRssMb],
  ]);
  return result;
}
