// The demo manuscript's review story (lib/server/demo/demo-story.ts), seeded on a fresh database as
// `npm run demo` and the browser tests seed it: what each figure and panel derives to, who waits on
// what, the mails and the activity it leaves, and that a second run adds nothing.
import { beforeAll, describe, expect, it } from "vitest";
import { getClient, getDb } from "@/db/client";
import { asc, eq } from "drizzle-orm";
import { mailOutbox, notices, users } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { seedDemoWithData } from "@/lib/server/demo/seed-demo";
import * as activity from "@/app/api/manuscripts/[id]/activity/route";
import * as figuresOfManuscript from "@/app/api/manuscripts/[id]/figures/route";
import * as panel from "@/app/api/panels/[id]/route";
import * as threads from "@/app/api/panels/[id]/threads/route";
import * as queue from "@/app/api/review-queue/route";
import { call, setupTestApp, type Who } from "./harness";

let tokens: Record<Who, string>;
let first: Awaited<ReturnType<typeof seedDemoWithData>>;
let second: Awaited<ReturnType<typeof seedDemoWithData>>;
let before: Record<string, number>;
let after: Record<string, number>;

/** Row count of every table. */
async function rowCounts(): Promise<Record<string, number>> {
  const client = getClient();
  const names = (await client.execute("select name from sqlite_master where type = 'table' order by name")).rows.map((r) => String(r.name));
  const out: Record<string, number> = {};
  for (const name of names) out[name] = Number((await client.execute(`select count(*) as n from "${name}"`)).rows[0].n);
  return out;
}

interface FigureView {
  id: string;
  number: number;
  title: string;
  widthMm: number;
  columns: number;
  reviewState: string;
  panels: Array<{ id: string; letter: string; title: string; colSpan: number; reviewState: string; currentRevision: { number: number } }>;
}
let figures: FigureView[];
const panelOf = (figure: number, letter: string) => figures.find((f) => f.number === figure)!.panels.find((p) => p.letter === letter)!;

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  first = await seedDemoWithData();
  before = await rowCounts();
  second = await seedDemoWithData();
  after = await rowCounts();
  figures = (await call(figuresOfManuscript.GET, { token: tokens.viewer, params: { id: DEMO_MANUSCRIPT_ID } })).json.items;
});

describe("the demo story", () => {
  it("is told once: the second run adds no row anywhere", () => {
    expect(first).toEqual({ filesAdded: 31, storyTold: true });
    expect(second).toEqual({ filesAdded: 0, storyTold: false });
    expect(after).toEqual(before);
    expect(before.figures).toBe(3);
    expect(before.panels).toBe(8);
    expect(before.revisions).toBe(9);
    expect(before.analyses).toBe(21);
    expect(before.decisions).toBe(7);
    expect(before.signoffs).toBe(1);
    expect(before.threads).toBe(1);
    expect(before.comments).toBe(2);
  });

  it("derives the review state of every figure and panel", () => {
    expect(
      figures.map((f) => ({
        number: f.number,
        title: f.title,
        widthMm: f.widthMm,
        columns: f.columns,
        state: f.reviewState,
        panels: f.panels.map((p) => `${p.letter} ${p.colSpan} r${p.currentRevision.number} ${p.reviewState}`),
      })),
    ).toEqual([
      {
        number: 1,
        title: "Coherence across surface treatments",
        widthMm: 183,
        columns: 2,
        state: "signed_off",
        panels: ["a 2 r1 signed_off", "b 1 r1 signed_off", "c 1 r1 signed_off"],
      },
      {
        number: 2,
        title: "Shallow NV proton sensing",
        widthMm: 183,
        columns: 3,
        state: "needs_revision",
        panels: ["a 1 r1 approved", "b 1 r1 needs_revision", "c 1 r1 in_review"],
      },
      {
        number: 3,
        title: "Charge state and saturation",
        widthMm: 89,
        columns: 1,
        state: "in_review",
        panels: ["a 1 r1 approved", "b 1 r2 in_review"],
      },
    ]);
  });

  it("Figure 1: every panel approved by the reviewer, then the PI's sign-off on the current hash", async () => {
    for (const letter of ["a", "b", "c"]) {
      const p = (await call(panel.GET, { token: tokens.viewer, params: { id: panelOf(1, letter).id } })).json;
      expect(p.decisions.map((d: any) => [d.userId, d.decision, d.stale])).toEqual([["demo-reviewer", "approved", false]]);
      expect(p.dataWarnings).toEqual([]);
    }
    const p = (await call(panel.GET, { token: tokens.viewer, params: { id: panelOf(1, "a").id } })).json;
    expect(p.figure.state).toBe("signed_off");
  });

  it("Figure 2: panel b sent back after a thread on an x-range and the author's reply; panel c waits", async () => {
    const b = (await call(panel.GET, { token: tokens.viewer, params: { id: panelOf(2, "b").id } })).json;
    expect(b.decisions.map((d: any) => [d.userId, d.decision, d.stale, d.note])).toEqual([
      ["demo-reviewer", "needs_revision", false, "State the bias field with its uncertainty and the fitted ¹H centre ± error on the panel."],
    ]);
    const [thread, ...others] = (await call(threads.GET, { token: tokens.viewer, params: { id: panelOf(2, "b").id } })).json.items;
    expect(others).toEqual([]);
    expect(thread).toMatchObject({ status: "open", revisionNumber: 1, anchor: { type: "xrange", x0: 8.852, x1: 8.972 } });
    expect(thread.comments.map((c: any) => [c.createdBy, c.mentions])).toEqual([
      ["demo-reviewer", ["demo-author"]],
      ["demo-author", ["demo-reviewer"]],
    ]);
    const c = (await call(panel.GET, { token: tokens.viewer, params: { id: panelOf(2, "c").id } })).json;
    expect(c.decisions).toEqual([]);
    expect(c.waitingOn).toEqual(["demo-reviewer"]);
  });

  it("Figure 3: the spectrum's approval is stale since version 2 was rebound; the map's holds", async () => {
    const b = (await call(panel.GET, { token: tokens.viewer, params: { id: panelOf(3, "b").id } })).json;
    expect(b.decisions.map((d: any) => [d.decision, d.stale, d.changes.map((ch: any) => ch.text)])).toEqual([
      ["approved", true, ['data "spectrum": version 1 → 2']],
    ]);
    expect(b.currentRevision.message).toBe("Rebind “spectrum” to PL spectrum, as-grown spot 2 (sample K17) version 2");
    const a = (await call(panel.GET, { token: tokens.viewer, params: { id: panelOf(3, "a").id } })).json;
    expect(a.decisions.map((d: any) => [d.decision, d.stale])).toEqual([["approved", false]]);
  });

  it("fills each demo user's waiting-on-me queue with exactly the story's items", async () => {
    const items = async (who: Who) =>
      ((await call(queue.GET, { token: tokens[who] })).json.items as Array<{ kind: string; figureNumber: number; letter?: string; what: string }>)
        .map((i) => `${i.kind} ${i.figureNumber}${i.letter ?? ""}: ${i.what}`)
        .sort();
    expect(await items("reviewer")).toEqual([
      "mention 2b: you were mentioned on panel b",
      "review 2c: review panel c (revision 1)",
      "review 3b: review panel b (revision 2)",
    ]);
    expect(await items("author")).toEqual(["revise 2b: panel b needs revision"]);
    expect(await items("pi")).toEqual([]);
    expect(await items("viewer")).toEqual([]);
    expect(await items("outsider")).toEqual([]);
  });

  it("leaves the activity and the mails those events cause", async () => {
    const log = (await call(activity.GET, { token: tokens.viewer, params: { id: DEMO_MANUSCRIPT_ID } })).json.items as Array<{ action: string; actor: string }>;
    const countOf = (action: string) => log.filter((e) => e.action === action).length;
    expect(
      Object.fromEntries(
        ["analysis.run", "dataset.upload", "figure.create", "panel.revise", "review.approved", "review.needs_revision", "comment.create", "figure.signoff"].map(
          (a) => [a, countOf(a)],
        ),
      ),
    ).toEqual({
      "analysis.run": 21,
      "dataset.upload": 31 + 21 + 3 + 1,
      "figure.create": 3,
      "panel.revise": 9,
      "review.approved": 6,
      "review.needs_revision": 1,
      "comment.create": 2,
      "figure.signoff": 1,
    });
    expect(log.find((e) => e.action === "figure.signoff")!.actor).toBe("Mira Halvorsen");
    // Each event's notice, to everyone it concerns but the one who acted.
    const told = await getDb()
      .select({ to: users.email, kind: notices.kind, headline: notices.headline })
      .from(notices)
      .innerJoin(users, eq(users.id, notices.userId))
      .orderBy(asc(notices.createdAt));
    const of = (to: string) => told.filter((n) => n.to === to).map((n) => `${n.kind}: ${n.headline}`);
    expect(of("author@lab.example.org")).toEqual([
      "approved: Figure 1a approved by Ines Varga",
      "approved: Figure 1b approved by Ines Varga",
      "approved: Figure 1c approved by Ines Varga",
      "signed_off: Figure 1 signed off",
      "approved: Figure 2a approved by Ines Varga",
      "mention: Ines Varga mentioned you on Figure 2b",
      "needs_revision: Figure 2b needs revision",
      "approved: Figure 3a approved by Ines Varga",
      "approved: Figure 3b approved by Ines Varga",
    ]);
    expect(of("reviewer@partner.example.org")).toEqual([
      "review_requested: Review requested: Figure 1a",
      "review_requested: Review requested: Figure 1b",
      "review_requested: Review requested: Figure 1c",
      "signed_off: Figure 1 signed off",
      "review_requested: Review requested: Figure 2a",
      "review_requested: Review requested: Figure 2b",
      "review_requested: Review requested: Figure 2c",
      "mention: Tomás Ekberg mentioned you on Figure 2b",
      "review_requested: Review requested: Figure 3a",
      "review_requested: Review requested: Figure 3b",
      "approval_stale: Your approval of Figure 3b went stale",
    ]);
    expect(of("pi@lab.example.org")).toEqual(["signoff_due: Figure 1 is ready for sign-off", "signoff_due: Figure 3 is ready for sign-off"]);
    expect(of("viewer@lab.example.org")).toEqual(["signed_off: Figure 1 signed off"]);
    // One mail per person, every notice in it.
    const mails = await getDb().select({ kind: mailOutbox.kind, to: mailOutbox.to, subject: mailOutbox.subject }).from(mailOutbox);
    expect(mails.map((m) => `${m.kind} → ${m.to}: ${m.subject.slice(0, 90)}`).sort()).toEqual([
      "notices → author@lab.example.org: 9 updates on Coherence and proton NMR of shallow NV centres…: Figure 1a approved by Ines V",
      "notices → pi@lab.example.org: 2 updates on Coherence and proton NMR of shallow NV centres…: Figure 1 is ready for sign-o",
      "notices → reviewer@partner.example.org: 11 updates on Coherence and proton NMR of shallow NV centres…: Review requested: Figure 1a",
      "signed_off → viewer@lab.example.org: Figure 1 signed off — Coherence and proton NMR of shallow NV centres…",
    ]);
  });
});
