// Digests through the real SMTP sink on a real SQLite file: a week of activity told in order with
// fixed timestamps (rows are moved to their moment right after each service call), digests run at
// the moments the schedules name, and the texts read back from the sink compared with what a person
// should read (written out by hand below). Empty digests send nothing; a rerun, a crash between
// enqueueing and marking, or a second instance never produce a second mail for one period.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getClient, getDb } from "@/db/client";
import { digestRuns, mailOutbox } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { commentDoc } from "@/lib/demo-data/story";
import { env } from "@/lib/env";
import { plainDoc } from "@/lib/review/rich-text";
import { importDatasetFromBytes } from "@/lib/server/datasets/upload-dataset";
import { addPanel } from "@/lib/server/figures/panels";
import { createFigure, getFigure } from "@/lib/server/figures/figures";
import { createRevision } from "@/lib/server/figures/revisions";
import { runDigests } from "@/lib/server/mail/digests";
import { deliverOutbox } from "@/lib/server/mail/outbox";
import { saveMailPreferences } from "@/lib/server/mail/preferences";
import { startMailSink, type SinkHandle } from "@/lib/server/mail/sink-server";
import { listSinkMessages, type SinkMessage } from "@/lib/server/mail/sink-store";
import { applyUnsubscribe } from "@/lib/server/mail/unsubscribe";
import { recordDecision, signOffFigure } from "@/lib/server/review/decisions";
import { sendToReview } from "@/lib/server/review/review-edges";
import { createThread, replyToThread } from "@/lib/server/review/threads";
import { setupTestApp } from "./harness";

const PI = { id: "demo-pi", email: "pi@lab.example.org", name: "Mira Halvorsen" };
const AUTHOR = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };
const REVIEWER = { id: "demo-reviewer", email: "reviewer@partner.example.org", name: "Ines Varga" };
const APP = "http://localhost:3000";
const MS = "Coherence and proton NMR of shallow NV centres in Kestrel-grown diamond";
const spec = (data: string, x: string, y: string) => ({
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: data },
  mark: "point",
  // Titled with units, so the print check lets the PI sign off without a reason.
  encoding: { x: { field: x, type: "quantitative", title: `${x} (a.u.)` }, y: { field: y, type: "quantitative", title: `${y} (a.u.)` } },
});
const csv = (s: string) => new TextEncoder().encode(s);

/** Runs a service call, then moves every row it created to the given moment (real time is long past it). */
async function at<T>(iso: string, fn: () => Promise<T>): Promise<T> {
  const mark = Date.now() - 1;
  const r = await fn();
  for (const table of ["datasets", "versions", "figures", "panels", "revisions", "threads", "comments", "decisions", "signoffs"])
    await getClient().execute({ sql: `update ${table} set created_at = ? where created_at >= ?`, args: [new Date(iso).getTime(), mark] });
  return r;
}

let sink: SinkHandle;
const seen = new Set<string>();
/** Runs the digests due at `iso`, delivers the outbox, answers the digest mails that arrived. */
async function digestsAt(iso: string) {
  const result = await runDigests(new Date(iso));
  await deliverOutbox();
  const fresh = listSinkMessages().filter((m) => !seen.has(m.id));
  for (const m of fresh) seen.add(m.id);
  return { result, mails: fresh.filter((m) => /^(Daily|Weekly) digest/.test(m.subject)).sort((a, b) => a.envelope.to[0]!.localeCompare(b.envelope.to[0]!)) };
}
const summary = (ms: SinkMessage[]) => ms.map((m) => `${m.envelope.to.join(",")}: ${m.subject}`);
/** The text without the footer, whose unsubscribe token changes with the clock. */
const body = (m: SinkMessage) => m.text.slice(0, m.text.indexOf("\n—\n")).replace(/\r\n/g, "\n");

const ids = { echo: "", depth: "", fig1: "", fig2: "", p1: "", p2: "", thread: "", early: "" };

beforeAll(async () => {
  process.env.APP_URL = APP;
  await setupTestApp();
  sink = await startMailSink({ port: env().smtpPort, dir: env().mailSinkDir, quiet: true });
  // The reviewer reads a weekly digest on Mondays at 08:00 in Berlin; everyone else keeps the default
  // (weekdays at 08:00, UTC as they never chose a zone).
  await saveMailPreferences(REVIEWER, {
    digest: "weekly",
    digestHour: "8",
    timeZone: "Europe/Berlin",
    "follow-shown.demo-manuscript": "1",
    "follow.demo-manuscript": "on",
  });
});
afterAll(async () => {
  await sink.close();
  delete process.env.APP_URL;
});

describe("a week of activity", () => {
  it("Friday: an early thread goes into the first digests, not into later ones", async () => {
    const v = await at("2026-01-02T09:00:00Z", () =>
      importDatasetFromBytes(AUTHOR, DEMO_MANUSCRIPT_ID, "echo.csv", csv("tau (µs),signal\n1,0.9\n2,0.8\n"), { name: "Echo NV01" }),
    );
    ids.echo = v.datasetId;
    ids.fig1 = (await at("2026-01-02T09:10:00Z", () => createFigure(AUTHOR, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Echo check" }))).id;
    ids.p1 = (await at("2026-01-02T09:10:00Z", () => addPanel(AUTHOR, ids.fig1, { title: "Echo of NV01" }))).id;
    const rev1 = await at("2026-01-02T09:20:00Z", () =>
      createRevision(AUTHOR, ids.p1, {
        spec: spec("echo", "tau", "signal"),
        bindings: { echo: { versionId: v.id } },
        baseRevisionId: null,
        message: "first cut",
      }),
    );
    await at("2026-01-02T09:20:00Z", () => sendToReview(AUTHOR, ids.p1));
    ids.early = (
      await at("2026-01-02T12:00:00Z", () => createThread(AUTHOR, ids.p1, { revisionId: rev1.id, body: plainDoc("Early draft, do not review yet.") }))
    ).id;

    // Monday 07:00 UTC is 08:00 in Berlin: the reviewer's first weekly digest; for the others it is
    // still Friday's 08:00 UTC period, which ended before the thread: nothing to say, nothing sent.
    const berlin = await digestsAt("2026-01-05T07:00:00Z");
    expect(berlin.result).toEqual({ sent: 1, empty: 4, taken: 0 });
    expect(summary(berlin.mails)).toEqual([`reviewer@partner.example.org: Weekly digest: 1 update on Coherence and proton NMR of shallow NV centres…`]);
    expect(body(berlin.mails[0]!)).toBe(
      [
        "Weekly digest for Ines Varga",
        "",
        "What happened on your manuscripts since Monday 29 December at 08:00 (Europe/Berlin).",
        "",
        `== ${MS}`,
        `${APP}/manuscripts/demo-manuscript`,
        "",
        "Figure 1 “Echo check”",
        "- Tomás Ekberg commented on Figure 1a: “Early draft, do not review yet.”",
        `  ${APP}/panels/${ids.p1}#thread-${ids.early}`,
        "",
      ].join("\n"),
    );
    // An hour later it is 08:00 UTC: the PI and the viewer read of the thread; its author does not
    // (nothing of their own), and the outsider's manuscript was quiet: empty, so not sent.
    const utc = await digestsAt("2026-01-05T08:00:00Z");
    expect(utc.result).toEqual({ sent: 2, empty: 2, taken: 0 });
    expect(summary(utc.mails)).toEqual([
      "pi@lab.example.org: Daily digest: 1 update on Coherence and proton NMR of shallow NV centres…",
      "viewer@lab.example.org: Daily digest: 1 update on Coherence and proton NMR of shallow NV centres…",
    ]);
    expect(body(utc.mails[0]!).split("\n")[2]).toBe("What happened on your manuscripts since Friday 2 January at 08:00 (UTC).");
    const outsider = await getDb().select().from(digestRuns).where(eq(digestRuns.userId, "demo-outsider"));
    expect(outsider.map((r) => [r.periodStart.toISOString(), r.items, r.mailId])).toEqual([
      ["2026-01-02T08:00:00.000Z", 0, null],
      ["2026-01-05T08:00:00.000Z", 0, null],
    ]);
    expect(listSinkMessages().filter((m) => m.envelope.to.includes("outsider@elsewhere.example.org"))).toEqual([]);
  });

  it("Monday to Saturday: reviews, a new data version, a discussion, a sign-off", async () => {
    const [rev1] = (await getFigure(AUTHOR, ids.fig1)).panels.map((p) => p.currentRevision!);
    const d = await at("2026-01-05T11:00:00Z", () =>
      importDatasetFromBytes(AUTHOR, DEMO_MANUSCRIPT_ID, "depth.csv", csv("x (nm),y\n1,2\n2,3\n"), { name: "Depth scan" }),
    );
    ids.depth = d.datasetId;
    ids.fig2 = (await at("2026-01-05T11:10:00Z", () => createFigure(AUTHOR, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "NV depth" }))).id;
    ids.p2 = (await at("2026-01-05T11:10:00Z", () => addPanel(AUTHOR, ids.fig2, { title: "" }))).id;
    const rev2a = await at("2026-01-05T11:20:00Z", () =>
      createRevision(AUTHOR, ids.p2, { spec: spec("depth", "x", "y"), bindings: { depth: { versionId: d.id } }, baseRevisionId: null, message: "" }),
    );
    await at("2026-01-05T11:20:00Z", () => sendToReview(AUTHOR, ids.p2));
    await at("2026-01-06T14:00:00Z", () => recordDecision(REVIEWER, ids.p1, { revisionId: rev1.id, decision: "approved", note: "" }));
    await at("2026-01-06T15:00:00Z", () =>
      recordDecision(REVIEWER, ids.p2, { revisionId: rev2a.id, decision: "approved", note: "Depth agrees with the NMR fit." }),
    );
    await at("2026-01-06T16:00:00Z", () => recordDecision(PI, ids.p1, { revisionId: rev1.id, decision: "approved", note: "" }));

    // Wednesday 08:00 UTC: the PI learns that Figure 2 waits for sign-off (and of the reviewer's approvals).
    const wed = await digestsAt("2026-01-07T08:00:00Z");
    expect(summary(wed.mails)).toEqual([
      "author@lab.example.org: Daily digest: 3 updates on Coherence and proton NMR of shallow NV centres…",
      "pi@lab.example.org: Daily digest: 4 updates on Coherence and proton NMR of shallow NV centres…",
      "viewer@lab.example.org: Daily digest: 3 updates on Coherence and proton NMR of shallow NV centres…",
    ]);
    const pi = wed.mails[1]!;
    expect(body(pi)).toBe(
      [
        "Daily digest for Mira Halvorsen",
        "",
        "What happened on your manuscripts since Monday 5 January at 08:00 (UTC).",
        "",
        `== ${MS}`,
        `${APP}/manuscripts/demo-manuscript`,
        "",
        "Figure 1 “Echo check”",
        "- Ines Varga approved Figure 1a (revision 1)",
        `  ${APP}/panels/${ids.p1}`,
        "- Figure 1 is ready for your sign-off: every panel is approved",
        `  ${APP}/figures/${ids.fig1}`,
        "",
        "Figure 2 “NV depth”",
        "- Ines Varga approved Figure 2a (revision 1): “Depth agrees with the NMR fit.”",
        `  ${APP}/panels/${ids.p2}`,
        "- Figure 2 is ready for your sign-off: every panel is approved",
        `  ${APP}/figures/${ids.fig2}`,
        "",
      ].join("\n"),
    );
    expect(pi.text).toMatch(/^Stop the digest: http:\/\/localhost:3000\/unsubscribe\?token=\S+$/m);

    const v2 = await at("2026-01-07T09:00:00Z", () =>
      importDatasetFromBytes(AUTHOR, DEMO_MANUSCRIPT_ID, "echo.csv", csv("tau (µs),signal\n1,0.91\n2,0.79\n"), { datasetId: ids.echo }),
    );
    await at("2026-01-07T10:00:00Z", () =>
      createRevision(AUTHOR, ids.p1, { spec: spec("echo", "tau", "signal"), bindings: { echo: { versionId: v2.id } }, baseRevisionId: rev1.id, message: "v2" }),
    );
    const [rev2] = (await getFigure(AUTHOR, ids.fig1)).panels.map((p) => p.currentRevision!);
    ids.thread = (
      await at("2026-01-08T15:00:00Z", () =>
        createThread(PI, ids.p1, { revisionId: rev2.id, body: commentDoc("Is σ from the fit? ", { mention: REVIEWER.id, label: REVIEWER.name }) }),
      )
    ).id;
    await at("2026-01-08T16:00:00Z", () => replyToThread(AUTHOR, ids.thread, { body: plainDoc("Yes: from the covariance & scaled by <√χ²>.") }));
    const f2 = await getFigure(PI, ids.fig2);
    await at("2026-01-09T16:00:00Z", () => signOffFigure(PI, ids.fig2, { figureHash: f2.figureHash }));
    await at("2026-01-10T10:00:00Z", () =>
      importDatasetFromBytes(AUTHOR, DEMO_MANUSCRIPT_ID, "depth.csv", csv("x (nm),y\n1,2.1\n2,3.2\n"), { datasetId: ids.depth }),
    );
    await at("2026-01-12T07:30:00Z", () => replyToThread(AUTHOR, ids.thread, { body: plainDoc("Monday morning, after the digest.") }));
  });

  it("the next Monday at 08:00 Berlin: the reviewer's week, grouped by manuscript then figure, each line a link", async () => {
    // 07:00 UTC is still Friday's period for the others: their digests of Friday go out too.
    const { result, mails } = await digestsAt("2026-01-12T07:00:00Z");
    expect(result).toEqual({ sent: 4, empty: 1, taken: 0 });
    expect(summary(mails)).toEqual([
      "author@lab.example.org: Daily digest: 1 update on Coherence and proton NMR of shallow NV centres…",
      "pi@lab.example.org: Daily digest: 2 updates on Coherence and proton NMR of shallow NV centres…",
      "reviewer@partner.example.org: Weekly digest: 6 updates on Coherence and proton NMR of shallow NV centres…",
      "viewer@lab.example.org: Daily digest: 2 updates on Coherence and proton NMR of shallow NV centres…",
    ]);
    const weekly = mails[2]!;
    expect(body(weekly)).toBe(
      [
        "Weekly digest for Ines Varga",
        "",
        "What happened on your manuscripts since Monday 5 January at 08:00 (Europe/Berlin).",
        "",
        `== ${MS}`,
        `${APP}/manuscripts/demo-manuscript`,
        "",
        "Figure 1 “Echo check”",
        "- Mira Halvorsen approved Figure 1a (revision 1)",
        `  ${APP}/panels/${ids.p1}`,
        '- Your approval of Figure 1a went stale: Tomás Ekberg saved revision 2 (data "echo": version 1 → 2); it waits for your review',
        `  ${APP}/panels/${ids.p1}`,
        "- Mira Halvorsen commented on Figure 1a: “Is σ from the fit? @Ines Varga”",
        `  ${APP}/panels/${ids.p1}#thread-${ids.thread}`,
        "- Tomás Ekberg commented on Figure 1a: “Yes: from the covariance & scaled by <√χ²>.”",
        `  ${APP}/panels/${ids.p1}#thread-${ids.thread}`,
        "",
        "Figure 2 “NV depth”",
        "- Mira Halvorsen signed off Figure 2",
        `  ${APP}/figures/${ids.fig2}`,
        "- Tomás Ekberg uploaded version 2 of “Depth scan” (depth.csv); Figure 2a uses version 1",
        `  ${APP}/datasets/${ids.depth}`,
        "",
      ].join("\n"),
    );
    // The HTML part (react-email, drawn in the render child) carries the same links, user text escaped,
    // no images, and a dark variant.
    expect(weekly.html).toContain('<meta name="color-scheme" content="light dark"/>');
    expect(weekly.html).not.toContain("<img");
    for (const href of [...weekly.text.matchAll(/^ {2}(http\S+)$/gm)].map((m) => m[1]!)) expect(weekly.html).toContain(`href="${href}"`);
    expect(weekly.html).toContain(`href="${APP}/panels/${ids.p1}#thread-${ids.thread}"`);
    expect(weekly.html).toContain("&lt;√χ²&gt;");
    expect(weekly.html).not.toContain("<√χ²>");
  });

  it("a second run in the same period sends nothing", async () => {
    const before = await getDb().select().from(mailOutbox).where(eq(mailOutbox.kind, "digest"));
    for (const iso of ["2026-01-12T07:00:00Z", "2026-01-12T07:59:00Z"]) {
      const { result, mails } = await digestsAt(iso);
      expect(result.sent).toBe(0);
      expect(mails).toEqual([]);
    }
    expect(await getDb().select().from(mailOutbox).where(eq(mailOutbox.kind, "digest"))).toHaveLength(before.length);
  });
});

describe("one digest per person and period", () => {
  const piMonday = new Date("2026-01-12T08:00:00Z");
  const piDigests = () =>
    getDb()
      .select({ id: digestRuns.id, mailId: digestRuns.mailId })
      .from(digestRuns)
      .where(and(eq(digestRuns.userId, PI.id), eq(digestRuns.periodStart, piMonday)));

  it("a crash between enqueueing and marking leaves neither; the rerun sends exactly one", async () => {
    const crash = () => {
      throw new Error("killed");
    };
    await expect(runDigests(piMonday, { beforeMark: async (u) => (u === PI.id ? crash() : undefined) })).rejects.toThrow("killed");
    expect(await piDigests()).toEqual([]);
    expect(
      await getDb()
        .select()
        .from(mailOutbox)
        .where(and(eq(mailOutbox.kind, "digest"), eq(mailOutbox.to, PI.email), eq(mailOutbox.status, "pending"))),
    ).toEqual([]);
    const { mails } = await digestsAt("2026-01-12T08:00:00Z");
    // Since Friday 08:00: the author's reply of Monday 07:30 (her own sign-off is not news to her).
    expect(summary(mails)).toContain("pi@lab.example.org: Daily digest: 1 update on Coherence and proton NMR of shallow NV centres…");
    expect(await piDigests()).toHaveLength(1);
  });

  it("a second instance that built the same digest stores nothing when the first has taken the period", async () => {
    // Tuesday 08:00 UTC: a reply of Monday noon is news to the PI and the viewer. Instance B builds the
    // digests, then instance A runs whole before B's transactions.
    await at("2026-01-12T12:00:00Z", () => replyToThread(AUTHOR, ids.thread, { body: plainDoc("Noon: bars redrawn.") }));
    const tuesday = "2026-01-13T08:00:00Z";
    let a: Awaited<ReturnType<typeof runDigests>> | undefined;
    const b = await runDigests(new Date(tuesday), {
      afterBuild: async () => {
        a ??= await runDigests(new Date(tuesday));
      },
    });
    expect(a).toEqual({ sent: 2, empty: 2, taken: 0 });
    expect(b).toEqual({ sent: 0, empty: 0, taken: 4 });
    const { result, mails } = await digestsAt(tuesday);
    expect(result).toEqual({ sent: 0, empty: 0, taken: 0 });
    expect(summary(mails)).toEqual([
      "pi@lab.example.org: Daily digest: 1 update on Coherence and proton NMR of shallow NV centres…",
      "viewer@lab.example.org: Daily digest: 1 update on Coherence and proton NMR of shallow NV centres…",
    ]);
  });

  it("the digest's unsubscribe link turns the digest off: no more digests, no more periods recorded", async () => {
    const mail = listSinkMessages().find((m) => m.envelope.to[0] === PI.email && m.subject.startsWith("Daily digest"))!;
    expect(mail.text).toContain("Stop the digest: http://localhost:3000/unsubscribe?token=");
    const token = decodeURIComponent(/unsubscribe\?token=(\S+)/.exec(mail.text)![1]!);
    const view = await applyUnsubscribe(token);
    expect(view.kinds).toEqual([{ kind: "digest", label: "the daily or weekly digest", alreadyOff: true }]);
    await at("2026-01-13T12:00:00Z", () => replyToThread(AUTHOR, ids.thread, { body: plainDoc("One more thing.") }));
    const { mails } = await digestsAt("2026-01-14T08:00:00Z");
    expect(summary(mails)).toEqual(["viewer@lab.example.org: Daily digest: 1 update on Coherence and proton NMR of shallow NV centres…"]);
    const runs = await getDb().select().from(digestRuns).where(eq(digestRuns.userId, PI.id));
    expect(runs.map((r) => r.periodStart.toISOString())).not.toContain("2026-01-14T08:00:00.000Z");
  });
});

describe("a busy figure", () => {
  it("shows its first seven lines and one line to the figure for the rest; the subject counts every update", async () => {
    // Thursday 15 January: twelve replies by the author on Figure 1; the viewer's Friday digest.
    for (let i = 1; i <= 12; i++)
      await at(`2026-01-15T09:${String(i).padStart(2, "0")}:00Z`, () => replyToThread(AUTHOR, ids.thread, { body: plainDoc(`Point ${i}.`) }));
    const { mails } = await digestsAt("2026-01-16T08:00:00Z");
    const viewer = mails.find((m) => m.envelope.to[0] === "viewer@lab.example.org")!;
    expect(viewer.subject).toBe("Daily digest: 12 updates on Coherence and proton NMR of shallow NV centres…");
    const lines = body(viewer)
      .split("\n")
      .filter((l) => l.startsWith("- "));
    expect(lines).toHaveLength(8);
    expect(lines[0]).toContain("“Point 1.”");
    expect(lines[6]).toContain("“Point 7.”");
    expect(lines[7]).toBe("- …and 5 more on Figure 1: open the figure to see them all");
    expect(body(viewer)).toContain(`see them all\n  ${APP}/figures/${ids.fig1}`);
  });

  it("a figure the reader unfollowed leaves their digest", async () => {
    const VIEWER = { id: "demo-viewer", email: "viewer@lab.example.org", name: "Luca Brenner" };
    await saveMailPreferences(VIEWER, {
      "follow-shown.demo-manuscript": "1",
      "follow.demo-manuscript": "on",
      [`figure-shown.${ids.fig1}`]: "1",
      [`figure-shown.${ids.fig2}`]: "1",
      [`figure.${ids.fig2}`]: "on",
    });
    await at("2026-01-16T10:00:00Z", () => replyToThread(AUTHOR, ids.thread, { body: plainDoc("Point 13.") }));
    const { mails } = await digestsAt("2026-01-19T08:00:00Z");
    expect(mails.map((m) => m.envelope.to[0])).not.toContain("viewer@lab.example.org");
    expect(mails.map((m) => m.envelope.to[0])).toContain("reviewer@partner.example.org");
  });
});
