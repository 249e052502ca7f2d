import "server-only";
import { outsideRequest } from "@/lib/request-memo";
import { and, asc, eq, lte, or, lt, isNull, isNotNull } from "drizzle-orm";
import nodemailer, { type Transporter } from "nodemailer";
import { getDb } from "@/db/client";
import { mailBounces, mailOutbox } from "@/db/schema";
import { env } from "@/lib/env";
import { flushNotices } from "./notices";
import { renderMailHtml, type MailView } from "./render-html";

const RENDER_BATCH = 500;

/**
 * Draws the HTML part of pending messages from their views (react-email, in the render child),
 * once per message: a retry sends what was drawn. A message whose drawing failed goes out as text.
 */
export async function drawPendingHtml(): Promise<void> {
  const db = getDb();
  for (;;) {
    const rows = await db
      .select({ id: mailOutbox.id, view: mailOutbox.view })
      .from(mailOutbox)
      .where(and(eq(mailOutbox.status, "pending"), isNull(mailOutbox.html), isNotNull(mailOutbox.view)))
      .limit(RENDER_BATCH);
    if (!rows.length) return;
    const html = await renderMailHtml(rows.map((r) => r.view as MailView)).catch((err: unknown) => {
      console.warn("[prooflight] mail HTML could not be drawn; sending text only:", (err as Error).message);
      return rows.map(() => null);
    });
    // A view that cannot be drawn is dropped, so the message leaves as text rather than waiting.
    for (const [i, r] of rows.entries())
      await db
        .update(mailOutbox)
        .set(html[i] ? { html: html[i] } : { view: null })
        .where(and(eq(mailOutbox.id, r.id), isNull(mailOutbox.html)));
    if (rows.length < RENDER_BATCH) return;
  }
}

const MAX_ATTEMPTS = 8;
const INTERRUPTED = "interrupted while sending: the server stopped before the relay's answer was recorded; sent again";
const LEASE_MS = 60_000;

/** Messages in flight at once, each on its own pooled SMTP connection. */
const SENDERS = 4;

/**
 * Pooled for one delivery run: a digest run reuses a few connections instead of a handshake per message.
 * Given a `url`, nodemailer reads its settings from the URL alone and drops every other option, so
 * ours travel in the URL's query (the relay's own, e.g. `?tls.rejectUnauthorized=false`, are kept).
 */
function openTransport(): Transporter {
  return nodemailer.createTransport(transportUrl(env().smtpUrl, env().instanceName));
}

export function transportUrl(smtpUrl: string, instanceName: string | undefined): string {
  const url = new URL(smtpUrl);
  const settings = {
    // The EHLO name: with several instances on one outbox, the relay's log says which one delivered.
    ...(instanceName ? { name: instanceName } : {}),
    pool: "true",
    maxConnections: String(SENDERS),
    connectionTimeout: "10000",
    greetingTimeout: "10000",
    socketTimeout: "30000",
  };
  for (const [key, value] of Object.entries(settings)) url.searchParams.set(key, value);
  return url.toString();
}

/**
 * Takes one due message by an atomic status change, so two workers never send the same mail.
 *
 * The one window SMTP leaves open: a sender that dies after the relay accepted a message and before
 * it marked the message sent cannot know the relay has it. After its lease runs out the message is
 * sent again with the same Message-ID (mail clients and many relays drop the second copy); each
 * such retry is logged and recorded on the message as "interrupted while sending", so the window is
 * counted, not hidden. Digest and notice periods themselves are taken once (unique keys), so a
 * crash never builds a second, different digest.
 */
async function claimNext(now: number) {
  const db = getDb();
  const leaseOver = and(eq(mailOutbox.status, "sending"), or(isNull(mailOutbox.leaseUntil), lt(mailOutbox.leaseUntil, new Date(now))));
  for (;;) {
    // Two index-friendly lookups: due pending mail first, then mail whose sender died mid-send.
    const [pending] = await db
      .select({ id: mailOutbox.id })
      .from(mailOutbox)
      .where(and(eq(mailOutbox.status, "pending"), lte(mailOutbox.nextAttemptAt, new Date(now))))
      .orderBy(asc(mailOutbox.nextAttemptAt))
      .limit(1);
    const [stranded] = pending ? [] : await db.select({ id: mailOutbox.id }).from(mailOutbox).where(leaseOver).limit(1);
    const due = pending ?? stranded;
    if (!due) return null;
    const interrupted = !pending;
    const [claimed] = await db
      .update(mailOutbox)
      .set({ status: "sending", leaseUntil: new Date(now + LEASE_MS), ...(interrupted ? { lastError: INTERRUPTED } : {}) })
      .where(and(eq(mailOutbox.id, due.id), interrupted ? leaseOver : eq(mailOutbox.status, "pending")))
      .returning();
    if (!claimed) continue; // another sender took it first: look for the next one
    if (interrupted)
      console.warn(`[prooflight] mail ${claimed.id} was interrupted while sending; sending it again with the same Message-ID (the relay may already have it).`);
    return claimed;
  }
}

let running: Promise<number> | null = null;

/** Delivers every due message; concurrent calls in one process share one run. */
export function deliverOutbox(): Promise<number> {
  running ??= deliverAll().finally(() => {
    running = null;
  });
  return running;
}

async function deliverAll(): Promise<number> {
  await flushNotices();
  await drawPendingHtml();
  const transport = openTransport();
  try {
    const counts = await Promise.all(Array.from({ length: SENDERS }, () => sendUntilDone(transport)));
    return counts.reduce((a, b) => a + b, 0);
  } finally {
    transport.close(); // idle connections would keep a command-line run (and the relay) waiting
  }
}

/** One sender: takes due messages one by one until none is left or the relay stops answering. */
async function sendUntilDone(transport: Transporter): Promise<number> {
  let sent = 0;
  for (;;) {
    const msg = await claimNext(Date.now());
    if (!msg) return sent;
    try {
      // Enqueued after this run drew the pending ones: draw it now.
      const html = msg.html ?? (msg.view ? ((await renderMailHtml([msg.view as MailView]).catch(() => [null]))[0] ?? null) : null);
      await transport.sendMail({
        from: env().mailFrom,
        to: msg.to,
        subject: msg.subject,
        text: msg.text,
        html: html ?? undefined,
        headers: msg.headers ?? undefined,
        messageId: `<${msg.id}@prooflight.localhost>`,
      });
      await getDb()
        .update(mailOutbox)
        // The HTML is written back only when it was drawn just now (it is already stored otherwise).
        .set({ status: "sent", sentAt: new Date(), leaseUntil: null, attempts: msg.attempts + 1, ...(msg.html ? {} : { html }) })
        .where(eq(mailOutbox.id, msg.id));
      await getDb().delete(mailBounces).where(eq(mailBounces.email, msg.to.toLowerCase()));
      sent++;
    } catch (err) {
      const tries = msg.attempts + 1;
      const { code, answer } = smtpAnswer(err);
      // 5xx: the receiving server refused for good (no such mailbox…): no retry, and the address is marked.
      const refused = code !== null && code >= 500;
      const failed = refused || tries >= MAX_ATTEMPTS;
      await getDb()
        .update(mailOutbox)
        .set({
          status: failed ? "failed" : "pending",
          attempts: tries,
          lastError: answer.slice(0, 500),
          nextAttemptAt: new Date(Date.now() + Math.min(2 ** tries * 1000, 10 * 60_000)),
          leaseUntil: null,
        })
        .where(eq(mailOutbox.id, msg.id));
      if (refused) {
        const row = { email: msg.to.toLowerCase(), answer: answer.slice(0, 500), at: new Date() };
        await getDb()
          .insert(mailBounces)
          .values(row)
          .onConflictDoUpdate({ target: mailBounces.email, set: { answer: row.answer, at: row.at } });
        continue; // the relay works; the next message may go through
      }
      return sent; // the relay is probably down or busy; the next tick retries, later and later
    }
  }
}

/** The SMTP reply code and text of a failed send (nodemailer puts them on the error), or the error's message. */
function smtpAnswer(err: unknown): { code: number | null; answer: string } {
  const e = err as { responseCode?: unknown; response?: unknown; message?: unknown };
  const code = typeof e?.responseCode === "number" ? e.responseCode : null;
  const answer = typeof e?.response === "string" && e.response ? e.response : String(err instanceof Error ? err.message : err);
  return { code, answer };
}

let soon: NodeJS.Timeout | undefined;
/**
 * Asks for a delivery run once the notices a write just made fall due: after the coalescing window
 * (MAIL_COALESCE_SECONDS) and a moment more, not at once, when there would be nothing to send yet.
 * A burst of writes (a busy thread) shares one run instead of each starting its own; the worker's
 * tick is the fallback.
 */
export function deliverOutboxSoon(delayMs = env().mailCoalesceMs + 250): void {
  if (soon) return;
  soon = outsideRequest(
    () =>
      setTimeout(() => {
        soon = undefined;
        void deliverOutbox().catch(() => undefined);
      }, delayMs).unref(), // a script that posted a comment need not wait for it: the server's worker sends it
  );
}

let timer: NodeJS.Timeout | undefined;
/** Started once per server process (instrumentation); retries happen on the next tick. */
export function startOutboxWorker(intervalMs = 5_000): void {
  if (timer) return;
  timer = setInterval(() => {
    void deliverOutbox().catch(() => undefined);
  }, intervalMs);
  timer.unref();
}
