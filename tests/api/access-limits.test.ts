// Who may read the mail outbox, which client address limits are keyed on, server-side sessions,
// and the rate limits on sign-in links, invitations and comments.
import { afterEach, beforeAll, describe, expect, it } from "vitest";
import { DEMO_ACCOUNTS, DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { resetEnvForTests } from "@/lib/env";
import { plainDoc } from "@/lib/review/rich-text";
import { clientAddress, isLoopback, PEER_HEADER } from "@/lib/server/limits/client-address";
import { outboxViewFor } from "@/lib/server/mail/outbox-access";
import { createSession, isSessionActive, revokeSession } from "@/lib/server/sessions";
import * as signInLink from "@/app/api/sign-in-link/route";
import * as members from "@/app/api/manuscripts/[id]/members/route";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as threads from "@/app/api/panels/[id]/threads/route";
import * as reply from "@/app/api/threads/[id]/comments/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
const account = (who: Who) => {
  const a = DEMO_ACCOUNTS.find((x) => x.email.startsWith(`${who}@`))!;
  return { id: a.id, email: a.email, name: a.name };
};
const peer = (address: string, extra: Record<string, string> = {}) => new Headers({ [PEER_HEADER]: address, ...extra });

const saved = { ...process.env };
function withEnv(vars: Record<string, string | undefined>) {
  for (const [k, v] of Object.entries(vars)) {
    if (v === undefined) delete process.env[k];
    else process.env[k] = v;
  }
  resetEnvForTests();
}

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  Object.assign(saved, process.env);
});
afterEach(() => {
  for (const k of ["PROOFLIGHT_INSTANCE", "MAIL_SINK_PAGE", "SMTP_URL", "TRUSTED_PROXIES", "COMMENTS_PER_MINUTE"]) {
    if (saved[k] === undefined) delete process.env[k];
    else process.env[k] = saved[k];
  }
  resetEnvForTests();
});

describe("the client address comes from the TCP peer, not from what a client writes", () => {
  it("ignores X-Forwarded-For unless the peer is a configured proxy", () => {
    expect(clientAddress(peer("203.0.113.9", { "x-forwarded-for": "127.0.0.1" }))).toBe("203.0.113.9");
    expect(clientAddress(peer("::ffff:198.51.100.4"))).toBe("198.51.100.4");
    expect(clientAddress(new Headers({ "x-forwarded-for": "10.1.1.1" }))).toBe("unknown");
    withEnv({ TRUSTED_PROXIES: "10.0.0.2, 10.0.0.3" });
    expect(clientAddress(peer("10.0.0.2", { "x-forwarded-for": "198.51.100.20, 10.0.0.3" }))).toBe("198.51.100.20");
    // A client's own prefix to the header is skipped: the rightmost untrusted hop is the client.
    expect(clientAddress(peer("10.0.0.2", { "x-forwarded-for": "1.2.3.4, 198.51.100.20" }))).toBe("198.51.100.20");
    expect(clientAddress(peer("10.0.0.2", { "x-forwarded-for": "not-an-address" }))).toBe("10.0.0.2");
  });

  it("knows loopback addresses", () => {
    expect(["127.0.0.1", "127.8.9.1", "::1", "::ffff:127.0.0.1"].map(isLoopback)).toEqual([true, true, true, true]);
    expect(["10.0.0.1", "::ffff:10.0.0.1", "", null, "localhost"].map(isLoopback)).toEqual([false, false, false, false, false]);
  });
});

describe("the mail outbox page cannot be used to read someone's sign-in link", () => {
  it("is off under production by default, even for this machine (the finding: it was on whenever SMTP_URL was unset)", async () => {
    withEnv({ PROOFLIGHT_INSTANCE: undefined, MAIL_SINK_PAGE: undefined, SMTP_URL: undefined });
    expect(await outboxViewFor(peer("127.0.0.1"), null)).toBeNull();
    expect(await outboxViewFor(peer("127.0.0.1"), account("pi"))).toBeNull();
  });

  it("a demo instance shows it to this machine only; a forged X-Forwarded-For does not help", async () => {
    withEnv({ PROOFLIGHT_INSTANCE: "demo" });
    expect(await outboxViewFor(peer("127.0.0.1"), null)).toEqual({ kind: "all" });
    expect(await outboxViewFor(peer("::1"), null)).toEqual({ kind: "all" });
    expect(await outboxViewFor(peer("203.0.113.9", { "x-forwarded-for": "127.0.0.1" }), null)).toBeNull();
    expect(await outboxViewFor(peer("203.0.113.9"), account("pi"))).toBeNull();
    expect(await outboxViewFor(new Headers(), null)).toBeNull();
  });

  it("a demo that sends real mail has no outbox page", async () => {
    withEnv({ PROOFLIGHT_INSTANCE: "demo", SMTP_URL: "smtp://relay.example.org:587" });
    expect(await outboxViewFor(peer("127.0.0.1"), null)).toBeNull();
  });

  it("production with MAIL_SINK_PAGE=on: signed-in lab members, each their own mail", async () => {
    withEnv({ PROOFLIGHT_INSTANCE: "production", MAIL_SINK_PAGE: "on" });
    expect(await outboxViewFor(peer("127.0.0.1"), null)).toBeNull();
    expect(await outboxViewFor(peer("203.0.113.9"), account("author"))).toEqual({ kind: "own", email: "author@lab.example.org" });
    // The reviewer belongs to no lab (a co-author from elsewhere).
    expect(await outboxViewFor(peer("127.0.0.1"), account("reviewer"))).toBeNull();
  });

  it("MAIL_SINK_PAGE=off closes it everywhere", async () => {
    withEnv({ PROOFLIGHT_INSTANCE: "development", MAIL_SINK_PAGE: "off" });
    expect(await outboxViewFor(peer("127.0.0.1"), null)).toBeNull();
  });
});

describe("sessions live on the server", () => {
  it("a revoked session is no longer active; revoking twice is harmless", async () => {
    const sid = await createSession("demo-viewer");
    expect(await isSessionActive(sid)).toBe(true);
    await revokeSession(sid);
    await revokeSession(sid);
    expect(await isSessionActive(sid)).toBe(false);
    expect(await isSessionActive(undefined)).toBe(false);
    expect(await isSessionActive("no-such-session")).toBe(false);
  });

  it("a session expires after 14 days", async () => {
    const t0 = Date.now();
    const sid = await createSession("demo-viewer", t0);
    expect(await isSessionActive(sid, t0 + 13 * 86_400_000)).toBe(true);
    expect(await isSessionActive(sid, t0 + 15 * 86_400_000)).toBe(false);
  });
});

describe("rate limits", () => {
  it("sign-in links: three per address in 15 minutes, then 429 with Retry-After — the same for an address with no account", async () => {
    for (const email of ["viewer@lab.example.org", "nobody-here@nowhere.example.org"]) {
      for (let i = 0; i < 3; i++) expect((await call(signInLink.POST, { method: "POST", body: { email } })).status).toBe(202);
      const r = await call(signInLink.POST, { method: "POST", body: { email } });
      expect(r.status).toBe(429);
      expect(r.json.error.message).toMatch(/Three sign-in links were sent to this address/);
      expect(Number(r.headers.get("retry-after"))).toBeGreaterThan(800);
      expect(Number(r.headers.get("retry-after"))).toBeLessThanOrEqual(900);
    }
  });

  it("invitations: three to one address a day", async () => {
    const invite = () =>
      call(members.POST, {
        method: "POST",
        token: tokens.pi,
        params: { id: DEMO_MANUSCRIPT_ID },
        body: { email: "often@partner.example.org", role: "viewer" },
      });
    for (let i = 0; i < 3; i++) expect((await invite()).status).toBe(201);
    const r = await invite();
    expect(r.status).toBe(429);
    expect(r.json.error.message).toMatch(/often@partner\.example\.org has been invited 3 times today/);
    expect(r.headers.get("retry-after")).toBeTruthy();
  });

  it("comments: the per-minute limit answers 429 with Retry-After, and a retry with the same clientKey is not counted", async () => {
    withEnv({ COMMENTS_PER_MINUTE: "3" });
    const post = (h: any, who: Who, params: Record<string, string>, body: unknown) => call(h, { method: "POST", token: tokens[who], params, body });
    const v = (
      await call(upload.POST, {
        method: "POST",
        token: tokens.author,
        params: { id: DEMO_MANUSCRIPT_ID },
        rawBody: uploadForm("limits.csv", "tau (µs),signal\n1,0.9\n2,0.8\n"),
      })
    ).json;
    const figureId = (await post(figuresRoute.POST, "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Limits" })).json.id;
    const panelId = (await post(panelsRoute.POST, "author", { id: figureId }, {})).json.id;
    const spec = { data: { name: "d" }, mark: "point", encoding: { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative" } } };
    const rev = (await post(revisions.POST, "author", { id: panelId }, { spec, bindings: { d: { versionId: v.id } }, baseRevisionId: null, message: "first" }))
      .json;
    const t = await post(threads.POST, "reviewer", { id: panelId }, { body: plainDoc("one"), revisionId: rev.id });
    expect(t.status).toBe(201);
    expect((await post(reply.POST, "reviewer", { id: t.json.id }, { body: plainDoc("two"), clientKey: "k2" })).status).toBe(201);
    expect((await post(reply.POST, "reviewer", { id: t.json.id }, { body: plainDoc("three") })).status).toBe(201);
    expect((await post(reply.POST, "reviewer", { id: t.json.id }, { body: plainDoc("two"), clientKey: "k2" })).status).toBe(201);
    const over = await post(reply.POST, "reviewer", { id: t.json.id }, { body: plainDoc("four") });
    expect(over.status).toBe(429);
    expect(over.json.error.message).toMatch(/many comments in the last minute/);
    expect(Number(over.headers.get("retry-after"))).toBeGreaterThan(0);
    // Another person is not affected.
    expect((await post(reply.POST, "author", { id: t.json.id }, { body: plainDoc("mine") })).status).toBe(201);
  });
});
