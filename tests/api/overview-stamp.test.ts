import { createClient, type Client } from "@libsql/client";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getClient } from "@/db/client";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import * as manuscript from "@/app/api/manuscripts/[id]/route";
import * as queue from "@/app/api/review-queue/route";
import * as approvals from "@/app/api/panels/[id]/approvals/route";
import { seedDemoWithData } from "@/lib/server/demo/seed-demo";
import { call, setupTestApp, type Who } from "./harness";

/**
 * The overview (GET /api/manuscripts/{id}) and the review queue are kept in memory per manuscript
 * under its review stamp. Writes here come through a second connection with plain SQL, as another
 * instance of the app or a script would make them: each must show on the next read of this one.
 */
let tokens: Record<Who, string>;
let other: Client;
const board = async () => (await call(manuscript.GET, { token: tokens.pi, params: { id: DEMO_MANUSCRIPT_ID } })).json;
const panelsOf = (b: any) => b.figures.flatMap((f: any) => f.panels);

/** Counts the statements this process sends from now on, on the database and in transactions. */
function countStatements() {
  const client = getClient();
  const execute = client.execute.bind(client);
  const transaction = client.transaction.bind(client);
  const seen: string[] = [];
  const note = (stmt: unknown) => seen.push(typeof stmt === "string" ? stmt : (stmt as { sql: string }).sql);
  client.execute = ((stmt: Parameters<Client["execute"]>[0]) => (note(stmt), execute(stmt))) as Client["execute"];
  client.transaction = (async (mode) => {
    const tx = await transaction(mode);
    const txExecute = tx.execute.bind(tx);
    tx.execute = ((stmt: Parameters<Client["execute"]>[0]) => (note(stmt), txExecute(stmt))) as typeof tx.execute;
    return tx;
  }) as Client["transaction"];
  const stop = () => {
    client.execute = execute as Client["execute"];
    client.transaction = transaction as Client["transaction"];
    return seen;
  };
  return { count: () => stop().length, statements: stop };
}

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  await seedDemoWithData();
  other = createClient({ url: process.env.DATABASE_URL! });
});
afterAll(() => other.close());

describe("an overview kept in memory sees writes made elsewhere", () => {
  it("every table the overview reads raises the stamp on insert, update and delete", async () => {
    const rs = await other.execute("SELECT tbl_name, name FROM sqlite_master WHERE type = 'trigger' AND name LIKE '%review_stamp'");
    const byTable = new Map<string, string[]>();
    for (const r of rs.rows) byTable.set(String(r.tbl_name), [...(byTable.get(String(r.tbl_name)) ?? []), String(r.name)]);
    expect([...byTable.keys()].sort()).toEqual([
      "datasets",
      "decisions",
      "figures",
      "manuscript_members",
      "panels",
      "revisions",
      "signoffs",
      "threads",
      "users",
    ]);
    for (const [table, names] of byTable) expect(names.length, table).toBe(table === "users" ? 1 : 3);
  });

  it("figure and panel titles, resolved threads, members, names and datasets", async () => {
    const before = await board();
    const fig = before.figures[0];
    const open = panelsOf(before).find((p: any) => p.openThreads > 0);
    expect(open).toBeTruthy();
    expect((await board()).figures[0].title).toBe(fig.title); // a second read is served from memory

    await other.execute({ sql: "UPDATE figures SET title = ? WHERE id = ?", args: ["Retitled by another instance", fig.id] });
    await other.execute({ sql: "UPDATE panels SET title = ? WHERE id = ?", args: ["Panel retitled elsewhere", fig.panels[0].id] });
    await other.execute({ sql: "UPDATE threads SET resolved_at = ?, resolved_by = 'demo-pi' WHERE panel_id = ?", args: [Date.now(), open.id] });
    await other.execute("UPDATE manuscript_members SET role = 'author' WHERE user_id = 'demo-viewer'");
    await other.execute("UPDATE users SET name = 'Renamed Viewer' WHERE id = 'demo-viewer'");
    await other.execute({
      sql: "INSERT INTO datasets (id, manuscript_id, name, kind, tags, created_by, created_at) VALUES ('elsewhere-ds', ?, 'added elsewhere', 'other', '{}', 'demo-author', ?)",
      args: [DEMO_MANUSCRIPT_ID, Date.now()],
    });

    const after = await board();
    expect(after.figures[0].title).toBe("Retitled by another instance");
    expect(after.figures[0].panels[0].title).toBe("Panel retitled elsewhere");
    expect(panelsOf(after).find((p: any) => p.id === open.id).openThreads).toBe(0);
    expect(after.members.find((m: any) => m.userId === "demo-viewer")).toMatchObject({ name: "Renamed Viewer", role: "author" });
    expect(after.datasetCount).toBe(before.datasetCount + 1);

    await other.execute("DELETE FROM datasets WHERE id = 'elsewhere-ds'");
    expect((await board()).datasetCount).toBe(before.datasetCount);
  });

  it("a decision made elsewhere changes the panel's approvals and takes it off the reviewer's queue", async () => {
    const waiting = (await call(queue.GET, { token: tokens.reviewer })).json.items.filter((i: any) => i.kind === "review");
    expect(waiting.length).toBeGreaterThan(0);
    const panel = panelsOf(await board()).find((p: any) => p.id === waiting[0].panelId);
    expect(panel.approvedBy).not.toContain("demo-reviewer");

    await other.execute({
      sql: "INSERT INTO decisions (id, panel_id, revision_id, content_hash, decision, note, user_id, created_at) VALUES ('elsewhere-dec', ?, ?, ?, 'approved', '', 'demo-reviewer', ?)",
      args: [panel.id, panel.currentRevision.id, panel.currentRevision.contentHash, Date.now()],
    });

    expect(panelsOf(await board()).find((p: any) => p.id === panel.id).approvedBy).toContain("demo-reviewer");
    const still = (await call(queue.GET, { token: tokens.reviewer })).json.items.filter((i: any) => i.kind === "review" && i.panelId === panel.id);
    expect(still).toEqual([]);
  });
});

describe("a decision made here amends the kept overview in place", () => {
  it("without reading the figures again, and equal to the overview read afresh", async () => {
    await board(); // kept
    const panel = panelsOf(await board()).find((p: any) => p.reviewState === "in_review" && p.currentRevision && !p.approvedBy.includes("demo-pi"));
    expect(panel).toBeTruthy();
    const during = countStatements();
    const r = await call(approvals.POST, {
      method: "POST",
      token: tokens.pi,
      params: { id: panel.id },
      body: { revisionId: panel.currentRevision.id, decision: "needs_revision", note: "units on the axis" },
    });
    expect(r.status).toBe(201);
    // The figure's review rows came from the kept overview: its decisions, sign-offs and threads were not read.
    const sqls = during.statements();
    expect(sqls.filter((q) => /WITH RECURSIVE deciders|from "signoffs"|from "threads"/i.test(q))).toEqual([]);
    const statements = countStatements();
    const amended = await board();
    // The caller's token, their role and the manuscript row: no figure, panel or decision was read.
    expect(statements.count()).toBe(3);
    expect(panelsOf(amended).find((p: any) => p.id === panel.id)).toMatchObject({ reviewState: "needs_revision", needsRevisionBy: ["demo-pi"] });
    // A stamp raised by someone else forces a full read: it must say the same thing.
    await other.execute({ sql: "UPDATE manuscripts SET review_stamp = review_stamp + 1 WHERE id = ?", args: [DEMO_MANUSCRIPT_ID] });
    expect(await board()).toEqual(amended);
  });
});
