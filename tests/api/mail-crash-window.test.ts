// The one window SMTP leaves open, stated and counted: `npm run digest` is killed (SIGKILL) right
// as the relay receives the first digest, before the sender can mark it sent. A second run a minute
// later builds no second digest for any period, sends that one message again under the same
// Message-ID (recorded on it as interrupted) and everything else once.
import { spawn, type ChildProcess } from "node:child_process";
import { once } from "node:events";
import type { AddressInfo } from "node:net";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { SMTPServer } from "smtp-server";
import { closeDb, getClient, getDb } from "@/db/client";
import { digestRuns, mailOutbox } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { plainDoc } from "@/lib/review/rich-text";
import { addPanel } from "@/lib/server/figures/panels";
import { createFigure } from "@/lib/server/figures/figures";
import { createRevision } from "@/lib/server/figures/revisions";
import { createThread } from "@/lib/server/review/threads";
import { setupTestApp } from "./harness";

const AUTHOR = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };
const DIGEST_AT = "2026-01-14T08:00:00Z"; // a Wednesday: the daily digests cover Tuesday 08:00 to now

/** What the relay received: the Message-ID and first recipient of each message, in order. */
const received: Array<{ messageId: string; to: string }> = [];
let child: ChildProcess | null = null;
let killOnFirst = true;
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
      received.push({ messageId: /^Message-ID:\s*(\S+)/im.exec(head)![1]!, to: session.envelope.rcptTo[0]!.address });
      if (killOnFirst) {
        killOnFirst = false;
        // The relay has the message; the sender dies before it hears "250". The whole process group
        // goes: tsx runs the command in a child of its own, which would otherwise live on and finish
        // the run itself.
        process.kill(-child!.pid!, "SIGKILL");
        return;
      }
      callback();
    });
  },
});

async function runDigestCommand(port: number): Promise<{ code: number | null; signal: NodeJS.Signals | null; out: string }> {
  const tsx = path.join(process.cwd(), "node_modules", ".bin", "tsx");
  child = spawn(tsx, ["--conditions=react-server", "scripts/digest.ts", "--at", DIGEST_AT], {
    env: { ...process.env, SMTP_URL: `smtp://127.0.0.1:${port}` },
    stdio: ["ignore", "pipe", "pipe"],
    detached: true, // its own process group, so a kill reaches the command and not only the tsx wrapper
  });
  let out = "";
  child.stdout!.on("data", (d: Buffer) => (out += d.toString()));
  child.stderr!.on("data", (d: Buffer) => (out += d.toString()));
  const [code, signal] = (await once(child, "exit")) as [number | null, NodeJS.Signals | null];
  return { code, signal, out };
}

const digestRows = () => getDb().select().from(mailOutbox).where(eq(mailOutbox.kind, "digest"));

let port: number;
beforeAll(async () => {
  await setupTestApp();
  // The demo story's own mails are not part of this check.
  await getDb().update(mailOutbox).set({ status: "failed" });
  const figureId = (await createFigure(AUTHOR, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Crash check" })).id;
  const panelId = (await addPanel(AUTHOR, figureId, { title: "Echo" })).id;
  const spec = { $schema: "https://vega.github.io/schema/vega-lite/v6.json", mark: "point", data: { values: [{ x: 1, y: 2 }] } };
  const rev = await createRevision(AUTHOR, panelId, { spec, bindings: {}, baseRevisionId: null, message: "" });
  const mark = Date.now() - 1;
  await createThread(AUTHOR, panelId, { revisionId: rev.id, body: plainDoc("Tuesday's question for everyone") });
  await getClient().execute({ sql: "update comments set created_at = ? where created_at >= ?", args: [new Date("2026-01-13T12:00:00Z").getTime(), mark] });
  await getDb().update(mailOutbox).set({ status: "failed" }).where(eq(mailOutbox.status, "pending"));
  relay.listen(0, "127.0.0.1");
  await once(relay.server, "listening");
  port = (relay.server.address() as AddressInfo).port;
  closeDb(); // the commands below open the database file themselves
}, 60_000);
afterAll(async () => {
  await new Promise<void>((resolve) => relay.close(() => resolve()));
});

describe("killed between the relay's receipt and the mark", () => {
  it("the first run dies holding a message; every digest period is already taken", async () => {
    const first = await runDigestCommand(port);
    expect(first.signal).toBe("SIGKILL");
    expect(received.length).toBeGreaterThanOrEqual(1);
    const rows = await digestRows();
    // The demo manuscript's other members: the PI, the reviewer and the viewer.
    expect(rows.map((r) => r.to).sort()).toEqual(["pi@lab.example.org", "reviewer@partner.example.org", "viewer@lab.example.org"]);
    // Four senders share the run: others may have been mid-message too; the first one is surely held.
    expect(rows.find((r) => `<${r.id}@prooflight.localhost>` === received[0]!.messageId)!.status).toBe("sending");
    expect(await getDb().select().from(digestRuns).where(eq(digestRuns.items, 1))).toHaveLength(3);
  }, 120_000);

  it("a minute later the rerun builds nothing new, resends what was held under the same Message-ID and counts it", async () => {
    // A minute passes: the dead sender's lease on its message runs out.
    await getDb()
      .update(mailOutbox)
      .set({ leaseUntil: new Date(Date.now() - 1) })
      .where(eq(mailOutbox.status, "sending"));
    const second = await runDigestCommand(port);
    expect(second.code, second.out).toBe(0);
    expect(second.out).toContain("0 enqueued");
    expect(second.out).toContain("was interrupted while sending; sending it again with the same Message-ID");
    const rows = await digestRows();
    expect(rows.map((r) => r.status)).toEqual(["sent", "sent", "sent"]);
    expect(await getDb().select().from(digestRuns).where(eq(digestRuns.items, 1))).toHaveLength(3);
    // One message per person however often it was handed over; only interrupted messages went twice.
    const perMessage = new Map<string, number>();
    for (const r of received) perMessage.set(r.messageId, (perMessage.get(r.messageId) ?? 0) + 1);
    expect(perMessage.size).toBe(3);
    expect(new Set(received.map((r) => r.to)).size).toBe(3);
    expect(perMessage.get(received[0]!.messageId)).toBe(2);
    for (const row of rows) {
      const times = perMessage.get(`<${row.id}@prooflight.localhost>`);
      if (times === 2) expect(row.lastError, row.to).toMatch(/^interrupted while sending/);
      else expect(times, row.to).toBe(1);
    }
  }, 120_000);
});
