// Delivery the PI can see, against a real SMTP server on loopback that refuses one address for good
// (550) and keeps answering "try later" (451) for another: the refused one fails at once and its
// address is marked as bouncing; the other is retried with growing waits, then fails; the PI sees both
// with the server's answer on the members page and can send them again; nobody else can.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { SMTPServer } from "smtp-server";
import { getDb } from "@/db/client";
import { mailBounces, mailOutbox } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { resetEnvForTests } from "@/lib/env";
import { mailDeliveryFor, resendMail } from "@/lib/server/mail/delivery";
import { deliverOutbox } from "@/lib/server/mail/outbox";
import { inviteMember } from "@/lib/server/members";
import { setupTestApp } from "./harness";

const PI = { id: "demo-pi", email: "pi@lab.example.org", name: "Mira Halvorsen" };
const AUTHOR = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };
const GONE = "gone@partner.example.org";
const BUSY = "busy@partner.example.org";

let server: SMTPServer;
let healed = false;
const received: string[] = [];

beforeAll(async () => {
  await setupTestApp();
  server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    onRcptTo(address, _session, callback) {
      if (!healed && address.address === GONE)
        return callback(Object.assign(new Error("5.1.1 <gone@partner.example.org>: mailbox unavailable"), { responseCode: 550 }));
      if (!healed && address.address === BUSY) return callback(Object.assign(new Error("4.3.2 try again later"), { responseCode: 451 }));
      callback();
    },
    onData(stream, session, callback) {
      stream.resume();
      stream.on("end", () => {
        received.push(...session.envelope.rcptTo.map((r) => r.address));
        callback();
      });
    },
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", () => resolve()));
  const port = (server.server.address() as { port: number }).port;
  process.env.SMTP_URL = `smtp://127.0.0.1:${port}`;
  resetEnvForTests();
  // What the demo seed queued goes out first, so the checks below see only their own mail.
  await deliverOutbox();
});
afterAll(async () => {
  await new Promise<void>((r) => server.close(() => r()));
  delete process.env.SMTP_URL;
});

const row = async (to: string) => (await getDb().select().from(mailOutbox).where(eq(mailOutbox.to, to)))[0]!;
/** Makes a waiting message due now, so the next delivery run tries it. */
const due = (to: string) =>
  getDb()
    .update(mailOutbox)
    .set({ nextAttemptAt: new Date(0) })
    .where(eq(mailOutbox.to, to));

describe("mail that does not arrive", () => {
  it("a refusal (5xx) fails at once and marks the address; a busy server (4xx) is retried later and later, then fails", async () => {
    await inviteMember(PI, DEMO_MANUSCRIPT_ID, { email: GONE, role: "reviewer" });
    await inviteMember(PI, DEMO_MANUSCRIPT_ID, { email: BUSY, role: "reviewer" });
    await deliverOutbox();
    const gone = await row(GONE);
    expect([gone.status, gone.attempts]).toEqual(["failed", 1]);
    expect(gone.lastError).toMatch(/^550 5\.1\.1 <gone@partner\.example\.org>: mailbox unavailable/);
    const [bounce] = await getDb().select().from(mailBounces).where(eq(mailBounces.email, GONE));
    expect(bounce!.answer).toMatch(/^550 /);

    const waits: number[] = [];
    for (let attempt = 1; attempt <= 8; attempt++) {
      const before = Date.now();
      if (attempt > 1) await due(BUSY);
      await deliverOutbox();
      const busy = await row(BUSY);
      expect(busy.attempts).toBe(attempt);
      if (busy.status === "pending") waits.push(Math.round((busy.nextAttemptAt.getTime() - before) / 1000));
    }
    // 2^n seconds after the n-th failure (the run's own time rounds to the second).
    expect(waits).toEqual([2, 4, 8, 16, 32, 64, 128]);
    const busy = await row(BUSY);
    expect(busy.status).toBe("failed");
    expect(busy.lastError).toMatch(/^451 4\.3\.2 try again later/);
    expect(received).not.toContain(GONE);
    expect(received).not.toContain(BUSY);
  });

  it("the PI sees both with the server's answer and the bouncing address; other members see nothing", async () => {
    const seen = await mailDeliveryFor(PI, DEMO_MANUSCRIPT_ID);
    expect(seen.failed.map((f) => [f.to, f.what, f.attempts, f.answer.slice(0, 3)]).sort()).toEqual([
      [BUSY, "invitation", 8, "451"],
      [GONE, "invitation", 1, "550"],
    ]);
    expect(seen.bounced.map((b) => [b.email, b.answer.slice(0, 9)])).toEqual([[GONE, "550 5.1.1"]]);
    await expect(mailDeliveryFor(AUTHOR, DEMO_MANUSCRIPT_ID)).rejects.toMatchObject({ status: 403 });
    await expect(resendMail(AUTHOR, DEMO_MANUSCRIPT_ID, (await row(GONE)).id)).rejects.toMatchObject({ status: 403 });
  });

  it("sent again once the address works, the mail arrives once and the mark goes", async () => {
    healed = true;
    const { id } = await row(GONE);
    expect(await resendMail(PI, DEMO_MANUSCRIPT_ID, id)).toEqual({ to: GONE });
    await expect(resendMail(PI, DEMO_MANUSCRIPT_ID, id)).rejects.toMatchObject({ status: 404 }); // no longer failed
    await deliverOutbox();
    expect(received.filter((r) => r === GONE)).toHaveLength(1);
    expect((await row(GONE)).status).toBe("sent");
    expect(await getDb().select().from(mailBounces)).toEqual([]);
    const seen = await mailDeliveryFor(PI, DEMO_MANUSCRIPT_ID);
    expect(seen.failed.map((f) => f.to)).toEqual([BUSY]);
    expect(seen.bounced).toEqual([]);
  });
});
