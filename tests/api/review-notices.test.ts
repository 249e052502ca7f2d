// Every review notice through the real SMTP sink: exactly one mail to the right people (never the
// actor), a subject that names the figure and panel, a link to the exact page; several notices to
// one person inside the window go out as one mail; mail preferences turn a kind or a manuscript off.
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { mailOutbox, mailPreferences, notices } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { commentDoc } from "@/lib/demo-data/story";
import { env } from "@/lib/env";
import { plainDoc } from "@/lib/review/rich-text";
import { importDatasetFromBytes } from "@/lib/server/datasets/upload-dataset";
import { addPanel } from "@/lib/server/figures/panels";
import { createFigure, getFigure, updateFigure } from "@/lib/server/figures/figures";
import { createRevision } from "@/lib/server/figures/revisions";
import { flushNotices } from "@/lib/server/mail/notices";
import { deliverOutbox } from "@/lib/server/mail/outbox";
import { startMailSink, type SinkHandle } from "@/lib/server/mail/sink-server";
import { listSinkMessages, type SinkMessage } from "@/lib/server/mail/sink-store";
import { recordDecision, signOffFigure } from "@/lib/server/review/decisions";
import { sendToReview } from "@/lib/server/review/review-edges";
import { createThread, listThreads, replyToThread } from "@/lib/server/review/threads";
import { setThreadFollow } from "@/lib/server/review/thread-follows";
import { describeUnsubscribe, unsubscribeToken } from "@/lib/server/mail/unsubscribe";
import { saveMailPreferences } from "@/lib/server/mail/preferences";
import * as unsubscribe from "@/app/api/unsubscribe/route";
import { call, setupTestApp } from "./harness";

const PI = { id: "demo-pi", email: "pi@lab.example.org", name: "Mira Halvorsen" };
const AUTHOR = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };
const REVIEWER = { id: "demo-reviewer", email: "reviewer@partner.example.org", name: "Ines Varga" };
const APP = "http://localhost:3000";
const MS = "Coherence and proton NMR of shallow NV centres…";
const SPEC = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  mark: "point",
  // Titled with units, so the print check lets the PI sign off without a reason.
  encoding: { x: { field: "tau", type: "quantitative", title: "τ (µs)" }, y: { field: "signal", type: "quantitative", title: "signal (norm.)" } },
};

let sink: SinkHandle;
const seen = new Set<string>();
/** Sends what is due a minute from now (past the coalescing window) and answers the mails that arrived. */
async function mailsAfterWindow(): Promise<SinkMessage[]> {
  await flushNotices(Date.now() + 61_000);
  await deliverOutbox();
  const fresh = listSinkMessages().filter((m) => !seen.has(m.id));
  for (const m of fresh) seen.add(m.id);
  return fresh.sort((a, b) => a.envelope.to[0]!.localeCompare(b.envelope.to[0]!));
}
const summary = (ms: SinkMessage[]) => ms.map((m) => `${m.envelope.to.join(",")}: ${m.subject}`);
const links = (m: SinkMessage) => [...m.text.matchAll(/^Open: (\S+)$/gm)].map((x) => x[1]);

let versionId: string, datasetId: string, figureId: string, panelId: string, rev1: { id: string }, rev2: { id: string }, rev3: { id: string; number: number };
beforeAll(async () => {
  process.env.APP_URL = APP;
  await setupTestApp();
  sink = await startMailSink({ port: env().smtpPort, dir: env().mailSinkDir, quiet: true });
  // The demo story's own mails were queued while no sink listened: not part of these checks.
  await getDb().update(mailOutbox).set({ status: "failed" }).where(eq(mailOutbox.status, "pending"));
  await mailsAfterWindow();
  const v1 = await importDatasetFromBytes(AUTHOR, DEMO_MANUSCRIPT_ID, "echo.csv", new TextEncoder().encode("tau (µs),signal\n1,0.9\n2,0.8\n"), {});
  versionId = v1.id;
  datasetId = v1.datasetId;
  figureId = (await createFigure(AUTHOR, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Echo check" })).id;
  panelId = (await addPanel(AUTHOR, figureId, { title: "Echo of NV01" })).id;
});
afterAll(async () => {
  await sink.close();
  delete process.env.APP_URL;
});

describe("each review notice, once, to the right people", () => {
  it("a draft asks nobody; sending it to review asks the reviewers (none named: every reviewer)", async () => {
    rev1 = await createRevision(AUTHOR, panelId, { spec: SPEC, bindings: { echo: { versionId } }, baseRevisionId: null, message: "first cut" });
    expect(summary(await mailsAfterWindow())).toEqual([]);
    await sendToReview(AUTHOR, panelId);
    const mails = await mailsAfterWindow();
    expect(summary(mails)).toEqual([`reviewer@partner.example.org: Review requested: Figure 1a — ${MS}`]);
    expect(links(mails[0]!)).toEqual([`${APP}/panels/${panelId}`]);
    expect(mails[0]!.text).toContain("Tomás Ekberg sent Figure 1a “Echo of NV01” (revision 1) to review; it waits for your review.");
    expect(mails[0]!.text).toContain("Revision note: first cut");
  });

  it("an approval tells the panel's author, and the last approval tells the PI that sign-off is due", async () => {
    await recordDecision(REVIEWER, panelId, { revisionId: rev1.id, decision: "approved", note: "clean" });
    const mails = await mailsAfterWindow();
    expect(summary(mails)).toEqual([
      `author@lab.example.org: Figure 1a approved by Ines Varga — ${MS}`,
      `pi@lab.example.org: Figure 1 is ready for sign-off — ${MS}`,
    ]);
    expect(links(mails[0]!)).toEqual([`${APP}/panels/${panelId}`]);
    expect(mails[0]!.text).toContain("Note: clean");
    expect(links(mails[1]!)).toEqual([`${APP}/figures/${figureId}`]);
  });

  it("a sign-off tells every member but the PI who signed", async () => {
    const f = await getFigure(PI, figureId);
    await signOffFigure(PI, figureId, { figureHash: f.figureHash });
    const mails = await mailsAfterWindow();
    expect(summary(mails)).toEqual([
      `author@lab.example.org: Figure 1 signed off — ${MS}`,
      `reviewer@partner.example.org: Figure 1 signed off — ${MS}`,
      `viewer@lab.example.org: Figure 1 signed off — ${MS}`,
    ]);
    expect(mails.map((m) => links(m))).toEqual([[`${APP}/figures/${figureId}`], [`${APP}/figures/${figureId}`], [`${APP}/figures/${figureId}`]]);
  });

  it("a rebind to a new data version tells the approver that the approval went stale, with what changed", async () => {
    const v2 = await importDatasetFromBytes(AUTHOR, DEMO_MANUSCRIPT_ID, "echo.csv", new TextEncoder().encode("tau (µs),signal\n1,0.91\n2,0.79\n"), {
      datasetId,
    });
    rev2 = await createRevision(AUTHOR, panelId, { spec: SPEC, bindings: { echo: { versionId: v2.id } }, baseRevisionId: rev1.id, message: "v2" });
    const mails = await mailsAfterWindow();
    expect(summary(mails)).toEqual([`reviewer@partner.example.org: Your approval of Figure 1a went stale — ${MS}`]);
    expect(mails[0]!.text).toContain('What changed: data "echo": version 1 → 2.');
    expect(links(mails[0]!)).toEqual([`${APP}/panels/${panelId}`]);
  });

  it("a request for a revision tells the panel's author, with the note", async () => {
    await recordDecision(REVIEWER, panelId, { revisionId: rev2.id, decision: "needs_revision", note: "Give σ." });
    const mails = await mailsAfterWindow();
    expect(summary(mails)).toEqual([`author@lab.example.org: Figure 1a needs revision — ${MS}`]);
    expect(mails[0]!.text).toContain("Ines Varga asked for a revision of Figure 1a “Echo of NV01” (revision 2).");
    expect(mails[0]!.text).toContain("Note: Give σ.");
  });

  it("a reply tells who wrote in the thread; a mention tells who is mentioned; the link opens the thread", async () => {
    const thread = await createThread(REVIEWER, panelId, { revisionId: rev2.id, body: plainDoc("Where are the error bars?") });
    expect(await mailsAfterWindow()).toEqual([]); // a new thread mentioning nobody tells nobody
    await replyToThread(AUTHOR, thread.id, { body: commentDoc({ mention: PI.id, label: PI.name }, " can you check the field value?") });
    const mails = await mailsAfterWindow();
    expect(summary(mails)).toEqual([
      `pi@lab.example.org: Tomás Ekberg mentioned you on Figure 1a — ${MS}`,
      `reviewer@partner.example.org: Tomás Ekberg replied on Figure 1a — ${MS}`,
    ]);
    expect(mails.map((m) => links(m))).toEqual([[`${APP}/panels/${panelId}#thread-${thread.id}`], [`${APP}/panels/${panelId}#thread-${thread.id}`]]);
    expect(mails[1]!.text).toContain("“@Mira Halvorsen can you check the field value?”");
  });
});

describe("several notices to one person within the window", () => {
  it("go out as one mail listing each; other people get their own; nothing goes out twice", async () => {
    const thread = await createThread(AUTHOR, panelId, {
      revisionId: rev2.id,
      body: commentDoc({ mention: PI.id, label: PI.name }, " and ", { mention: REVIEWER.id, label: REVIEWER.name }, " — σ bars added."),
    });
    rev3 = await createRevision(AUTHOR, panelId, {
      spec: { ...SPEC, mark: "circle" },
      bindings: { echo: { versionId } },
      baseRevisionId: rev2.id,
      message: "σ bars",
    });
    // Inside the window nothing is sent yet.
    expect(await flushNotices(Date.now())).toBe(0);
    const mails = await mailsAfterWindow();
    expect(summary(mails)).toEqual([
      `pi@lab.example.org: Tomás Ekberg mentioned you on Figure 1a — ${MS}`,
      `reviewer@partner.example.org: 2 updates on ${MS}: Tomás Ekberg mentioned you on Figure 1a; Review requested: Figure 1a`,
    ]);
    expect(links(mails[1]!)).toEqual([`${APP}/panels/${panelId}#thread-${thread.id}`, `${APP}/panels/${panelId}`]);
    expect(mails[1]!.text).toContain("Tomás Ekberg saved revision 3 of Figure 1a");
    expect(rev3.number).toBe(3);
    // Flushing and delivering again sends nothing more; every notice names the one mail it went out in.
    expect(await flushNotices(Date.now() + 61_000)).toBe(0);
    await deliverOutbox();
    expect(listSinkMessages().filter((m) => !seen.has(m.id))).toEqual([]);
    expect(await getDb().select().from(notices).where(isNull(notices.mailId))).toEqual([]);
  });

  it("carries the one-click unsubscribe headers (RFC 8058) and a link in the body", async () => {
    const [mail] = listSinkMessages().filter((m) => m.envelope.to.includes("pi@lab.example.org") && m.subject.startsWith("Tomás Ekberg mentioned you"));
    const raw = fs.readFileSync(path.join(env().mailSinkDir, `${mail!.id}.eml`), "utf8").replace(/\r\n[ \t]+/g, " ");
    expect(raw).toMatch(/^List-Unsubscribe: <http:\/\/localhost:3000\/api\/unsubscribe\?token=[\w.%-]+>\r$/m);
    expect(raw).toMatch(/^List-Unsubscribe-Post: List-Unsubscribe=One-Click\r$/m);
    expect(mail!.text).toMatch(/^Stop mails about @mentions: http:\/\/localhost:3000\/unsubscribe\?token=[\w.%-]+$/m);
  });
});

describe("named reviewers", () => {
  it("a figure that names its reviewers asks only them, whatever their role", async () => {
    const fig = (await createFigure(AUTHOR, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Named" })).id;
    await updateFigure(PI, fig, { requiredReviewers: [PI.id] });
    const pid = (await addPanel(AUTHOR, fig, { title: "Spectrum" })).id;
    await createRevision(AUTHOR, pid, { spec: SPEC, bindings: { echo: { versionId } }, baseRevisionId: null, message: "" });
    await sendToReview(AUTHOR, pid);
    const mails = await mailsAfterWindow();
    expect(summary(mails)).toEqual([`pi@lab.example.org: Review requested: Figure 2a — ${MS}`]);
    expect(links(mails[0]!)).toEqual([`${APP}/panels/${pid}`]);
  });
});

describe("one-click unsubscribe", () => {
  const piMentionMail = () =>
    listSinkMessages().find((m) => m.envelope.to.includes("pi@lab.example.org") && m.subject.startsWith("Tomás Ekberg mentioned you"))!;
  const oneClickUrl = (m: SinkMessage) =>
    /^List-Unsubscribe: <([^>]+)>/m.exec(fs.readFileSync(path.join(env().mailSinkDir, `${m.id}.eml`), "utf8").replace(/\r\n[ \t]+/g, " "))![1]!;
  const post = (url: string) =>
    call(unsubscribe.POST, {
      method: "POST",
      path: url.replace(APP, ""),
      rawBody: "List-Unsubscribe=One-Click",
      headers: { "content-type": "application/x-www-form-urlencoded" },
    });
  const withToken = (url: string, token: string) => url.replace(/token=[^&]+/, `token=${encodeURIComponent(token)}`);
  const tokenIn = (url: string) => decodeURIComponent(/token=([^&]+)/.exec(url)![1]!);

  it("the body's link opens a page that asks first; opening the one-click address lands there too", async () => {
    const link = /^Stop mails about @mentions: (\S+)$/m.exec(piMentionMail().text)![1]!;
    expect(link.startsWith(`${APP}/unsubscribe?token=`)).toBe(true);
    expect(await describeUnsubscribe(tokenIn(link))).toEqual({
      email: "pi@lab.example.org",
      kinds: [{ kind: "mention", label: "@mentions", alreadyOff: false }],
    });
    const opened = await call(unsubscribe.GET, { path: oneClickUrl(piMentionMail()).replace(APP, "") });
    expect(opened.status).toBe(303);
    expect(opened.headers.get("location")).toBe(link);
  });

  it("refuses a changed token, another person's name under this signature, and an expired token", async () => {
    const url = oneClickUrl(piMentionMail());
    const [payload, mac] = tokenIn(url).split(".");
    const claims = JSON.parse(Buffer.from(payload!, "base64url").toString("utf8"));
    const forAuthor = Buffer.from(JSON.stringify({ ...claims, u: AUTHOR.id })).toString("base64url");
    const invalid =
      "This unsubscribe link is not valid: it was changed or cut short. Use the link from the mail as it is, or choose your mail on the settings page.";
    for (const forged of [`${payload}.${mac!.slice(0, -2)}xx`, `${forAuthor}.${mac}`, `${payload}.`, "garbage"]) {
      const r = await post(withToken(url, forged));
      expect([r.status, r.json.error.message]).toEqual([400, invalid]);
    }
    const old = unsubscribeToken(PI.id, ["mention"], Date.now() - 61 * 24 * 3600 * 1000);
    const r = await post(withToken(url, old));
    expect([r.status, r.json.error.message]).toEqual([
      410,
      "This unsubscribe link has expired. Sign in and choose which mails you get on the mail settings page.",
    ]);
    const missing = await call(unsubscribe.POST, { method: "POST", path: "/api/unsubscribe" });
    expect(missing.status).toBe(400);
    expect(await getDb().select().from(mailPreferences)).toEqual([]);
  });

  it("a mail client's one-click POST, signed out, turns the kind off and says so; the kind then stays quiet", async () => {
    const r = await post(oneClickUrl(piMentionMail()));
    expect(r.status).toBe(200);
    expect(r.json).toEqual({ ok: true, email: "pi@lab.example.org", turnedOff: ["mention"], message: "Turned off for pi@lab.example.org: @mentions." });
    const [p] = await getDb().select().from(mailPreferences).where(eq(mailPreferences.userId, PI.id));
    expect(p!.mutedKinds).toEqual(["mention"]);
    expect((await post(oneClickUrl(piMentionMail()))).status).toBe(200); // a second click changes nothing
    await createThread(AUTHOR, panelId, { revisionId: rev3.id, body: commentDoc({ mention: PI.id, label: PI.name }, " once more") });
    expect(await mailsAfterWindow()).toEqual([]);
  });
});

describe("mail preferences", () => {
  it("a kind turned off, or a manuscript unfollowed, sends nothing of it", async () => {
    const everyKindOn = Object.fromEntries(
      ["review_requested", "needs_revision", "approved", "signoff_due", "signed_off", "approval_stale", "reply", "mention"].map((k) => [`kind.${k}`, "on"]),
    );
    // The form sends only ticked boxes: review requests unticked for the reviewer, the manuscript unticked for the author.
    const reviewerForm: Record<string, string> = { ...everyKindOn, [`follow-shown.${DEMO_MANUSCRIPT_ID}`]: "1", [`follow.${DEMO_MANUSCRIPT_ID}`]: "on" };
    delete reviewerForm["kind.review_requested"];
    const saved = await saveMailPreferences(REVIEWER, reviewerForm);
    expect(saved.kinds.filter((k) => !k.on).map((k) => k.kind)).toEqual(["review_requested"]);
    const authorSaved = await saveMailPreferences(AUTHOR, { ...everyKindOn, [`follow-shown.${DEMO_MANUSCRIPT_ID}`]: "1" });
    expect(authorSaved.manuscripts.find((m) => m.id === DEMO_MANUSCRIPT_ID)!.following).toBe(false);
    const rev4 = await createRevision(AUTHOR, panelId, { spec: SPEC, bindings: { echo: { versionId } }, baseRevisionId: rev3.id, message: "again" });
    const thread = await createThread(REVIEWER, panelId, { revisionId: rev4.id, body: commentDoc({ mention: AUTHOR.id, label: AUTHOR.name }, " look") });
    expect(thread.comments).toHaveLength(1);
    expect(await mailsAfterWindow()).toEqual([]);
  });
});

describe("following figures and threads", () => {
  const kinds = ["review_requested", "needs_revision", "approved", "signoff_due", "signed_off", "approval_stale", "reply", "mention"];
  const form = (over: Record<string, string>) => ({
    ...Object.fromEntries(kinds.map((k) => [`kind.${k}`, "on"])),
    [`follow-shown.${DEMO_MANUSCRIPT_ID}`]: "1",
    [`follow.${DEMO_MANUSCRIPT_ID}`]: "on",
    ...over,
  });

  it("an unfollowed figure sends nothing about it; the manuscript's other figures still do", async () => {
    const second = (await createFigure(AUTHOR, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Field check" })).id;
    const otherPanel = (await addPanel(AUTHOR, second, { title: "ODMR of NV01" })).id;
    // Review requests stay off for the reviewer (as the previous test left them), so only mentions are in play.
    const reviewerForm = form({ [`figure-shown.${figureId}`]: "1", [`figure-shown.${second}`]: "1", [`figure.${second}`]: "on" });
    delete (reviewerForm as Record<string, string>)["kind.review_requested"];
    const saved = await saveMailPreferences(REVIEWER, reviewerForm);
    const figs = saved.manuscripts.find((m) => m.id === DEMO_MANUSCRIPT_ID)!.figures;
    expect(figs.map((f) => [f.label, f.following])).toEqual([
      ["Figure 1 — Echo check", false],
      ["Figure 2 — Named", true], // not on this form: keeps its setting
      ["Figure 3 — Field check", true],
    ]);
    await saveMailPreferences(AUTHOR, form({}));
    const otherRev = await createRevision(AUTHOR, otherPanel, { spec: SPEC, bindings: { echo: { versionId } }, baseRevisionId: null, message: "first" });
    await mailsAfterWindow();
    const rev = (await getFigure(AUTHOR, figureId)).panels[0]!.currentRevision!;
    await createThread(AUTHOR, panelId, { revisionId: rev.id, body: commentDoc({ mention: REVIEWER.id, label: REVIEWER.name }, " figure one") });
    await createThread(AUTHOR, otherPanel, { revisionId: otherRev.id, body: commentDoc({ mention: REVIEWER.id, label: REVIEWER.name }, " figure two") });
    expect(summary(await mailsAfterWindow())).toEqual([`reviewer@partner.example.org: Tomás Ekberg mentioned you on Figure 3a — ${MS}`]);
  });

  it("a follower who never wrote hears of replies; a writer who stopped following does not", async () => {
    await saveMailPreferences(REVIEWER, form({}));
    await saveMailPreferences(PI, form({}));
    const rev = (await getFigure(AUTHOR, figureId)).panels[0]!.currentRevision!;
    const thread = await createThread(REVIEWER, panelId, { revisionId: rev.id, body: plainDoc("Is the baseline subtracted?") });
    expect((await listThreads(PI, panelId)).find((t) => t.id === thread.id)!.followingReplies).toBe(false);
    expect((await listThreads(REVIEWER, panelId)).find((t) => t.id === thread.id)!.followingReplies).toBe(true);
    await setThreadFollow(PI, thread.id, { following: true });
    await setThreadFollow(REVIEWER, thread.id, { following: false });
    expect((await listThreads(PI, panelId)).find((t) => t.id === thread.id)!.followingReplies).toBe(true);
    expect((await listThreads(REVIEWER, panelId)).find((t) => t.id === thread.id)!.followingReplies).toBe(false);
    await mailsAfterWindow();
    await replyToThread(AUTHOR, thread.id, { body: plainDoc("Yes, a linear baseline.") });
    const mails = await mailsAfterWindow();
    expect(summary(mails)).toEqual([`pi@lab.example.org: Tomás Ekberg replied on Figure 1a — ${MS}`]);
    expect(links(mails[0]!)).toEqual([`${APP}/panels/${panelId}#thread-${thread.id}`]);
  });
});
