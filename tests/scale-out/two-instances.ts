// Two instances, shared nothing but the database and the store: two `next start` processes on one
// SQLite file and one S3-compatible bucket (a local fake S3 server, s3rver), each with its own
// uploads folder (part files and derived caches only), both running the outbox worker and the digest
// scheduler against one SMTP relay hosted here. It shows that
//   - a file uploaded through one instance is fitted, downloaded and exported through the other
//     (the bytes live in the bucket, not on either machine), parsed once, and a thumbnail drawn on
//     one instance's request is served by the other without drawing it again;
//   - every message in the outbox reaches the relay exactly once although both workers deliver
//     (each instance greets the relay with its INSTANCE_NAME, so both are seen at work);
//   - each person's digest for the period is built once (one period row, one mail) although both
//     schedulers look every second.
// Needs a production build (.next): `npm test` runs it after building, before the browser tests.
// By hand: npx tsx --conditions=react-server tests/scale-out/two-instances.ts
import assert from "node:assert/strict";
import { spawn, type ChildProcess } from "node:child_process";
import { createHash } from "node:crypto";
import { once } from "node:events";
import fs from "node:fs";
import type { AddressInfo } from "node:net";
import os from "node:os";
import path from "node:path";
import { and, eq, inArray } from "drizzle-orm";
import { unzipSync } from "fflate";
import { SMTPServer } from "smtp-server";
import { closeDb, getClient, getDb } from "@/db/client";
import { applyMigrations } from "@/db/migrate";
import { digestRuns, mailOutbox } from "@/db/schema";
import { DEMO_ACCOUNTS, DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { hahnEchoFiles } from "@/lib/demo-data/hahn-echo";
import { resetEnvForTests } from "@/lib/env";
import { plainDoc } from "@/lib/review/rich-text";
import { createApiToken } from "@/lib/server/api-tokens";
import { seedDemo } from "@/lib/server/demo/seed-demo";
import { addPanel } from "@/lib/server/figures/panels";
import { createFigure } from "@/lib/server/figures/figures";
import { createRevision } from "@/lib/server/figures/revisions";
import { DEFAULT_DIGEST_SCHEDULE, latestDigestSlot } from "@/lib/server/mail/digest-schedule";
import { enqueueMail } from "@/lib/server/mail/enqueue";
import { createThread } from "@/lib/server/review/threads";
import { blobStore } from "@/lib/server/storage/store";
import { startFakeS3 } from "../support/fake-s3";

const root = process.cwd();
if (!fs.existsSync(path.join(root, ".next", "BUILD_ID"))) {
  console.error("✕ two instances: no production build in .next (run `next build` first).");
  process.exit(1);
}

const VL = "https://vega.github.io/schema/vega-lite/v6.json";
const AUTHOR = DEMO_ACCOUNTS.find((a) => a.email.startsWith("author@"))!;
const PI = DEMO_ACCOUNTS.find((a) => a.email.startsWith("pi@"))!;
const WAVE = 10;

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-two-"));
const fake = await startFakeS3("prooflight-two");

/** What the relay received: Message-ID, recipient and the instance that greeted it (EHLO name). */
const received: Array<{ messageId: string; to: string; from: string }> = [];
const relay = new SMTPServer({
  authOptional: true,
  disabledCommands: ["STARTTLS", "AUTH"],
  logger: false,
  onData(stream, session, callback) {
    const chunks: Buffer[] = [];
    stream.on("data", (c: Buffer) => chunks.push(c));
    stream.on("end", () => {
      const head = Buffer.concat(chunks)
        .toString("utf8")
        .split(/\r?\n\r?\n/)[0]!;
      received.push({ messageId: /^Message-ID:\s*(\S+)/im.exec(head)![1]!, to: session.envelope.rcptTo[0]!.address, from: session.hostNameAppearsAs });
      // A relay that takes a moment per message keeps both workers' runs overlapping.
      setTimeout(() => callback(), 20);
    });
  },
});
relay.listen(0, "127.0.0.1");
await once(relay.server, "listening");
const relayPort = (relay.server.address() as AddressInfo).port;

const shared: Record<string, string> = {
  ...fake.env,
  DATABASE_URL: `file:${path.join(dir, "shared.db")}`,
  AUTH_SECRET: "two-instances-secret-two-instances-secret",
  SMTP_URL: `smtp://127.0.0.1:${relayPort}`,
  PROOFLIGHT_INSTANCE: "production",
  MAIL_SINK_PAGE: "off",
  MAIL_COALESCE_SECONDS: "0",
  DIGEST_INTERVAL_SECONDS: "1",
  NEXT_TELEMETRY_DISABLED: "1",
};
Object.assign(process.env, shared, { UPLOADS_DIR: path.join(dir, "setup-uploads") });
resetEnvForTests();

const children: ChildProcess[] = [];
const logs: string[] = [];
let failed = false;
try {
  // The database both instances share: the demo lab, one API token each for the author and the PI.
  await applyMigrations();
  await seedDemo();
  const authorToken = (await createApiToken(AUTHOR, { name: "two instances" })).token;
  const piToken = (await createApiToken(PI, { name: "two instances" })).token;
  // Something for yesterday's digest: a question asked just before the latest digest moment.
  const figure = await createFigure(AUTHOR, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Digest material" });
  const panel = await addPanel(AUTHOR, figure.id, { title: "Echo" });
  const rev = await createRevision(AUTHOR, panel.id, {
    spec: { $schema: VL, mark: "point", data: { values: [{ x: 1, y: 2 }] } },
    bindings: {},
    baseRevisionId: null,
    message: "",
  });
  const slot = latestDigestSlot(DEFAULT_DIGEST_SCHEDULE, new Date())!;
  const mark = Date.now() - 1;
  await createThread(AUTHOR, panel.id, { revisionId: rev.id, body: plainDoc("A question for everyone before the digest") });
  await getClient().execute({ sql: "update comments set created_at = ? where created_at >= ?", args: [slot.getTime() - 60_000, mark] });
  closeDb();

  // Two instances on one database file and one bucket, each with its own uploads folder and name.
  const ports = [3311, 3312];
  const names = ["instance-a", "instance-b"];
  const bases = ports.map((p) => `http://localhost:${p}`);
  for (const [i, port] of ports.entries()) {
    const log = path.join(dir, `${names[i]}.log`);
    logs.push(log);
    const out = fs.openSync(log, "w");
    children.push(
      spawn(process.execPath, [path.join(root, "node_modules", "next", "dist", "bin", "next"), "start", "-p", String(port)], {
        detached: true,
        stdio: ["ignore", out, out],
        env: { ...process.env, ...shared, PORT: String(port), APP_URL: bases[i]!, INSTANCE_NAME: names[i]!, UPLOADS_DIR: path.join(dir, names[i]!) },
      }),
    );
  }
  for (const base of bases) await waitFor(`${base} to answer`, 90_000, async () => (await fetch(`${base}/api/health`).catch(() => null))?.ok === true);
  const [a, b] = bases as [string, string];
  const api = async (base: string, method: string, url: string, token: string, body?: unknown) => {
    const res = await fetch(`${base}${url}`, {
      method,
      headers: { authorization: `Bearer ${token}`, ...(body instanceof FormData || body === undefined ? {} : { "content-type": "application/json" }) },
      body: body instanceof FormData ? body : body === undefined ? undefined : JSON.stringify(body),
    });
    return res;
  };
  const json = async (res: Response, status: number, what: string) => {
    const text = await res.text();
    assert.equal(res.status, status, `${what}: ${text.slice(0, 300)}`);
    return JSON.parse(text);
  };

  // 1. A file uploaded through A is fitted, read and exported through B.
  const echo = hahnEchoFiles()[0]!;
  const sha = createHash("sha256").update(echo.content).digest("hex");
  const form = new FormData();
  form.set("file", new Blob([echo.content]), echo.fileName);
  const version = await json(await api(a, "POST", `/api/manuscripts/${DEMO_MANUSCRIPT_ID}/datasets`, authorToken, form), 201, "upload through A");
  assert.equal(version.sha256, sha);
  assert.ok(await blobStore().exists(sha), "the upload is an object in the bucket");
  const fit = await json(
    await api(b, "POST", "/api/analyses", authorToken, { versionId: version.id, model: "hahn_echo", options: { x: "tau", y: "signal", sigma: "sigma" } }),
    201,
    "fit through B",
  );
  assert.ok(fit.parameters.some((p: { name: string }) => p.name === "T2"));
  const rawRes = await api(b, "GET", `/api/versions/${version.id}/raw`, piToken);
  assert.equal(rawRes.status, 200);
  assert.equal(
    createHash("sha256")
      .update(new Uint8Array(await rawRes.arrayBuffer()))
      .digest("hex"),
    sha,
    "raw download through B",
  );
  const fig = await json(
    await api(a, "POST", "/api/figures", authorToken, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Two instances", widthMm: 89, columns: 1 }),
    201,
    "figure",
  );
  const pan = await json(await api(a, "POST", `/api/figures/${fig.id}/panels`, authorToken, {}), 201, "panel");
  const enc = { x: { field: "tau", type: "quantitative", title: "τ (µs)" }, y: { field: "signal", type: "quantitative", title: "signal" } };
  await json(
    await api(a, "POST", `/api/panels/${pan.id}/revisions`, authorToken, {
      baseRevisionId: null,
      bindings: { echo: { versionId: version.id }, fit: { analysisId: fit.id, output: "curve" } },
      spec: {
        $schema: VL,
        width: 200,
        height: 140,
        layer: [
          { data: { name: "echo" }, mark: "point", encoding: enc },
          { data: { name: "fit" }, mark: "line", encoding: enc },
        ],
      },
    }),
    201,
    "revision through A",
  );
  const bundle = await api(b, "GET", `/api/figures/${fig.id}/export?format=bundle`, piToken);
  assert.equal(bundle.status, 200, "bundle through B");
  const files = unzipSync(new Uint8Array(await bundle.arrayBuffer()));
  const rawPath = Object.keys(files).find((p) => p.startsWith("raw/"))!;
  assert.equal(createHash("sha256").update(files[rawPath]!).digest("hex"), sha, "the bundle from B carries the bytes uploaded through A");
  for (const name of names) {
    const kept = fs.readdirSync(path.join(dir, name)).filter((n) => n !== "tmp");
    assert.deepEqual(kept, [], `${name} keeps no stored file of its own`);
  }
  console.log("✓ uploaded through A; fitted, downloaded and exported through B from the shared bucket");

  // 1b. Work one instance did is not done again by the other: the parsed columns (written by A's
  // upload, read by B's fit) and the figure's thumbnail (drawn on A's request, served by B).
  const writesOf = (prefix: string) => fake.writes.filter((w) => w.event.startsWith("ObjectCreated") && w.key.startsWith(prefix)).length;
  assert.equal(writesOf(`cache/${sha}.columns`), 1, "the upload was parsed once");
  const thumbA = await api(a, "GET", `/api/figures/${fig.id}/thumbnail`, piToken);
  assert.equal(thumbA.status, 200);
  const pngA = new Uint8Array(await thumbA.arrayBuffer());
  assert.equal(writesOf("cache/thumbs/figure-"), 1, "A drew the thumbnail and kept it in the bucket");
  const thumbB = await api(b, "GET", `/api/figures/${fig.id}/thumbnail`, piToken);
  assert.equal(thumbB.status, 200);
  assert.deepEqual(new Uint8Array(await thumbB.arrayBuffer()), pngA, "B serves A's thumbnail");
  assert.equal(writesOf("cache/thumbs/figure-"), 1, "B did not draw it again");
  console.log("✓ the upload parsed once and the thumbnail drawn once for both instances");

  // 2. Mail: waves of messages until both instances' workers have delivered some.
  const db = getDb();
  const waveIds: string[] = [];
  await waitFor("both instances to deliver mail", 90_000, async () => {
    for (let i = 0; i < WAVE; i++)
      waveIds.push(
        await enqueueMail(db, {
          kind: "scale-out-check",
          to: `person${waveIds.length}@lab.example.org`,
          subject: `Check ${waveIds.length}`,
          text: "One copy only.",
        }),
      );
    await new Promise((r) => setTimeout(r, 1000));
    return new Set(received.map((r) => r.from)).size === 2;
  });
  await waitFor("the outbox to empty", 90_000, async () => {
    const open = await db
      .select({ id: mailOutbox.id })
      .from(mailOutbox)
      .where(inArray(mailOutbox.status, ["pending", "sending"]));
    return open.length === 0;
  });

  // 3. Digests: the three other members' digest for the latest period, built once.
  const others = DEMO_ACCOUNTS.filter((p) => p.id !== AUTHOR.id && !p.email.startsWith("outsider")).map((p) => p.id);
  await waitFor("the digest period to be taken", 60_000, async () => {
    const runs = await db.select().from(digestRuns).where(eq(digestRuns.periodStart, slot));
    return runs.filter((r) => r.items > 0).length >= 3;
  });
  await waitFor("the digests to be delivered", 60_000, async () => {
    const open = await db
      .select({ id: mailOutbox.id })
      .from(mailOutbox)
      .where(inArray(mailOutbox.status, ["pending", "sending"]));
    return open.length === 0;
  });
  // Both schedulers keep looking every second: give them a few more looks at the same period.
  await new Promise((r) => setTimeout(r, 3000));

  const rows = await db.select().from(mailOutbox);
  const perMessage = new Map<string, number>();
  for (const r of received) perMessage.set(r.messageId, (perMessage.get(r.messageId) ?? 0) + 1);
  const twice = [...perMessage].filter(([, n]) => n > 1);
  assert.deepEqual(twice, [], "no message reached the relay twice");
  const sent = rows.filter((r) => r.status === "sent").map((r) => `<${r.id}@prooflight.localhost>`);
  assert.deepEqual([...perMessage.keys()].sort(), sent.sort(), "the relay received exactly the messages marked sent");
  assert.deepEqual(
    rows.filter((r) => waveIds.includes(r.id)).map((r) => r.status),
    waveIds.map(() => "sent"),
  );
  const byInstance = Object.fromEntries(names.map((n) => [n, received.filter((r) => r.from === n).length]));
  console.log(`✓ ${received.length} messages, each received once: ${names.map((n) => `${byInstance[n]} from ${n}`).join(", ")}`);

  const runs = await db.select().from(digestRuns).where(eq(digestRuns.periodStart, slot));
  assert.equal(new Set(runs.map((r) => r.userId)).size, runs.length, "one period row per person");
  for (const id of others) assert.equal(runs.filter((r) => r.userId === id && r.items > 0).length, 1, `one digest period row for ${id}`);
  const digests = await db
    .select()
    .from(mailOutbox)
    .where(
      and(
        eq(mailOutbox.kind, "digest"),
        inArray(
          mailOutbox.id,
          runs.map((r) => r.mailId).filter((m): m is string => !!m),
        ),
      ),
    );
  assert.equal(digests.length, others.length, "one digest mail per member with something to read");
  for (const d of digests) assert.equal(perMessage.get(`<${d.id}@prooflight.localhost>`), 1, `${d.to}'s digest received once`);
  const allDigests = await db.select().from(mailOutbox).where(eq(mailOutbox.kind, "digest"));
  assert.equal(allDigests.length, others.length, "no second digest was built for the period");
  console.log(`✓ ${digests.length} digests for the period starting ${slot.toISOString()}, each built and received once`);
} catch (err) {
  failed = true;
  console.error("✕ two instances:", err instanceof Error ? (err.stack ?? err.message) : err);
  const seen = new Map<string, number>();
  for (const r of received) seen.set(r.from, (seen.get(r.from) ?? 0) + 1);
  console.error(`  the relay received ${received.length} messages: ${[...seen].map(([k, n]) => `${n} from ${k}`).join(", ") || "none"}`);
  for (const log of logs)
    if (fs.existsSync(log)) console.error(`--- ${path.basename(log)} (last lines)\n${fs.readFileSync(log, "utf8").split("\n").slice(-30).join("\n")}`);
} finally {
  for (const c of children)
    try {
      if (c.pid) process.kill(-c.pid, "SIGTERM");
    } catch {
      /* already gone */
    }
  await Promise.all(children.map((c) => (c.exitCode === null && c.signalCode === null ? once(c, "exit") : null)));
  closeDb();
  await new Promise<void>((resolve) => relay.close(() => resolve()));
  await fake.close();
  if (!failed) fs.rmSync(dir, { recursive: true, force: true });
}
console.log(failed ? "two instances: FAILED" : "two instances: passed");
process.exit(failed ? 1 : 0);

async function waitFor(what: string, timeoutMs: number, check: () => Promise<boolean>): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (await check()) return;
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`timed out waiting for ${what}`);
}
