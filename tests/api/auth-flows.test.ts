import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, mailOutbox } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { env } from "@/lib/env";
import * as members from "@/app/api/manuscripts/[id]/members/route";
import * as signInLink from "@/app/api/sign-in-link/route";
import * as authRoute from "@/app/api/auth/[...nextauth]/route";
import { verifyAuditChain } from "@/lib/server/audit";
import { deliverOutbox } from "@/lib/server/mail/outbox";
import { startMailSink, type SinkHandle } from "@/lib/server/mail/sink-server";
import { listSinkMessages } from "@/lib/server/mail/sink-store";
import { acceptInvitation } from "@/lib/server/members";
import { recordSignInFailure, signInBlock, signInBlockedReason } from "@/lib/server/sign-in-limits";
import { consumeSignInLink } from "@/lib/server/sign-in-links";
import { verifyPassword } from "@/lib/server/users";
import { call, setupTestApp, type Who } from "./harness";

let tokens: Record<Who, string>;
let sink: SinkHandle;
beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  sink = await startMailSink({ port: env().smtpPort, dir: env().mailSinkDir, quiet: true });
});
afterAll(async () => {
  await sink.close();
});

const tokenFrom = (text: string, pattern: RegExp) => decodeURIComponent(pattern.exec(text)![1]!);

describe("invitations through the real SMTP sink", () => {
  it("an invitation mail arrives, its link creates the account once, and it is audited", async () => {
    const r = await call(members.POST, {
      method: "POST",
      token: tokens.pi,
      params: { id: DEMO_MANUSCRIPT_ID },
      body: { email: "guest@partner.example.org", role: "reviewer" },
    });
    expect(r.status).toBe(201);
    expect(await deliverOutbox()).toBeGreaterThanOrEqual(0);
    await deliverOutbox();
    const mail = listSinkMessages().find((m) => m.envelope.to.includes("guest@partner.example.org"))!;
    expect(mail.subject).toMatch(/Invitation/);
    const token = tokenFrom(mail.text, /\/invite\/(\S+)/);
    const accepted = await acceptInvitation({ token, name: "Guest Reviewer", password: "a-long-password" });
    expect(accepted.manuscriptId).toBe(DEMO_MANUSCRIPT_ID);
    expect(await verifyPassword("guest@partner.example.org", "a-long-password")).toMatchObject({ name: "Guest Reviewer" });
    await expect(acceptInvitation({ token, name: "Again", password: "a-long-password" })).rejects.toThrow(/already used or expired/);
    const sent = await getDb().select().from(mailOutbox).where(eq(mailOutbox.to, "guest@partner.example.org"));
    expect(sent.map((s) => s.status)).toEqual(["sent"]);
    const actions = (await getDb().select().from(auditLog)).map((a) => a.action);
    expect(actions).toEqual(expect.arrayContaining(["member.invite", "member.join"]));
  });

  it("a mail is never sent twice, even when delivery runs twice at once", async () => {
    const before = listSinkMessages().length;
    await call(members.POST, {
      method: "POST",
      token: tokens.pi,
      params: { id: DEMO_MANUSCRIPT_ID },
      body: { email: "once@partner.example.org", role: "viewer" },
    });
    await Promise.all([deliverOutbox(), deliverOutbox(), deliverOutbox()]);
    await deliverOutbox();
    expect(listSinkMessages().filter((m) => m.envelope.to.includes("once@partner.example.org"))).toHaveLength(1);
    expect(listSinkMessages().length).toBe(before + 1);
  });
});

describe("sign-in links", () => {
  it("a link from the sink signs in exactly once", async () => {
    const r = await call(signInLink.POST, { method: "POST", body: { email: "viewer@lab.example.org" } });
    expect(r.status).toBe(202);
    await deliverOutbox();
    const mail = listSinkMessages().find((m) => m.subject.includes("sign-in link"))!;
    const token = tokenFrom(mail.text, /token=(\S+)/);
    expect(await consumeSignInLink(token)).toMatchObject({ email: "viewer@lab.example.org" });
    expect(await consumeSignInLink(token)).toBeNull();
  });

  it("answers the same for an unknown address and sends nothing", async () => {
    const before = listSinkMessages().length;
    const r = await call(signInLink.POST, { method: "POST", body: { email: "nobody@nowhere.example.org" } });
    expect(r.status).toBe(202);
    await deliverOutbox();
    expect(listSinkMessages().length).toBe(before);
  });
});

describe("failed sign-ins are rate-limited", () => {
  it("per account: a growing wait, answered 429 by the Auth.js endpoint, never a lockout", async () => {
    const email = "author@lab.example.org";
    const t0 = Date.parse("2026-12-02T10:00:00Z");
    expect(await signInBlockedReason(email, "10.0.0.1", t0)).toBeNull();
    // Five wrong passwords from five addresses, one second apart.
    for (let i = 0; i < 5; i++) await recordSignInFailure(email, `192.0.2.${i}`, t0 + i * 1000);
    const last = t0 + 4000;
    // Waits: 3 failures → 2 s, 4 → 4 s, 5 → 8 s after the latest (hand-computed from the rule 2^(n-2) s).
    expect(await signInBlock(email, "10.0.0.1", last + 1000)).toMatchObject({ retryAfterSeconds: 7 });
    expect(await signInBlockedReason(email, "10.0.0.1", last + 1000)).toMatch(/try again in 7 s, or use an e-mail sign-in link/);
    // The owner is not locked out: eight seconds after the latest failure the password works again.
    expect(await signInBlock(email, "10.0.0.1", last + 8000)).toBeNull();
  });

  it("the Auth.js endpoint answers 429 with Retry-After while an account waits", async () => {
    const email = "viewer@lab.example.org";
    for (let i = 0; i < 6; i++) await recordSignInFailure(email, "192.0.2.50");
    const form = new URLSearchParams({ email, password: "wrong" });
    const r = await call(authRoute.POST, {
      method: "POST",
      path: "/api/auth/callback/password",
      rawBody: form,
      headers: { "content-type": "application/x-www-form-urlencoded" },
    });
    expect(r.status).toBe(429);
    expect(r.json.error.code).toBe("too_many_requests");
    expect(Number(r.headers.get("retry-after"))).toBeGreaterThan(0);
  });

  it("per address: many accounts from one IP", async () => {
    for (let i = 0; i < 20; i++) await recordSignInFailure(`user${i}@x.example.org`, "198.51.100.7");
    expect(await signInBlockedReason("someone@x.example.org", "198.51.100.7")).toMatch(/from this address/);
    expect(await signInBlockedReason("someone@x.example.org", "198.51.100.8")).toBeNull();
  });
});

describe("audit log", () => {
  it("is a hash chain whose tampering is detected", async () => {
    expect(await verifyAuditChain(getDb())).toMatchObject({ ok: true });
    const [first] = await getDb().select().from(auditLog).limit(1);
    await getDb().update(auditLog).set({ data: '{"forged":true}' }).where(eq(auditLog.seq, first!.seq));
    expect(await verifyAuditChain(getDb())).toMatchObject({ ok: false, seq: first!.seq });
  });
});
