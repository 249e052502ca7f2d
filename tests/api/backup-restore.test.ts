// Backups taken while the app keeps writing, restored into an empty location and compared; a
// damaged backup restores nothing; restore never writes over an existing database.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { getClient } from "@/db/client";
import { plainDoc } from "@/lib/review/rich-text";
import { createBackup, openDatabaseFile, type BackupManifest } from "@/lib/server/backup/backup";
import { restoreBackup } from "@/lib/server/backup/restore";
import { createThread, replyToThread } from "@/lib/server/review/threads";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { importDatasetFromBytes } from "@/lib/server/datasets/upload-dataset";
import { addPanel } from "@/lib/server/figures/panels";
import { createFigure } from "@/lib/server/figures/figures";
import { createRevision } from "@/lib/server/figures/revisions";
import { setupTestApp } from "./harness";

const AUTHOR = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };
const REVIEWER = { id: "demo-reviewer", email: "reviewer@partner.example.org", name: "Ines Varga" };
const count = async (sql: string) => Number((await getClient().execute(sql)).rows[0]![0]);

let base: string;
let manifest: BackupManifest;
let commentsBefore: number, commentsAfter: number;
beforeAll(async () => {
  await setupTestApp();
  base = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-backup-"));
  await importDatasetFromBytes(AUTHOR, DEMO_MANUSCRIPT_ID, "echo.csv", new TextEncoder().encode("tau (µs),signal\n1,0.9\n2,0.8\n"), {});
  const figureId = (await createFigure(AUTHOR, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Backup check" })).id;
  const panelId = (await addPanel(AUTHOR, figureId, { title: "Echo" })).id;
  const spec = { $schema: "https://vega.github.io/schema/vega-lite/v6.json", mark: "point", data: { values: [{ x: 1, y: 2 }] } };
  const rev = await createRevision(AUTHOR, panelId, { spec, bindings: {}, baseRevisionId: null, message: "" });
  const threadId = (await createThread(REVIEWER, panelId, { revisionId: rev.id, body: plainDoc("A question before the backup.") })).id;
  commentsBefore = await count("SELECT count(*) FROM comments");
  // Replies keep being written (by two people, within the comment rate limit) while the backup runs;
  // the backup starts once the first five are in.
  let started!: () => void;
  const fiveIn = new Promise<void>((resolve) => (started = resolve));
  const writer = (async () => {
    for (let i = 0; i < 50; i++) {
      await replyToThread(i % 2 ? AUTHOR : REVIEWER, threadId, { body: plainDoc(`Reply ${i} during the backup.`) });
      if (i === 4) started();
    }
  })();
  await fiveIn;
  manifest = await createBackup(path.join(base, "backup"));
  await writer;
  commentsAfter = await count("SELECT count(*) FROM comments");
}, 120_000);

describe("a backup under write load", () => {
  it("lists the database and every upload a version names, each with its hash", async () => {
    const versions = (await getClient().execute("SELECT DISTINCT sha256 FROM versions ORDER BY sha256")).rows.map((r) => String(r.sha256));
    expect(manifest.blobs.map((b) => b.sha256)).toEqual(versions);
    expect(manifest.database.file).toBe("prooflight.db");
    expect(manifest.database.sha256).toMatch(/^[0-9a-f]{64}$/);
  });

  it("restores into an empty location: every hash checks, the audit chain is intact, and the rows are those of one moment", async () => {
    const target = { databaseFile: path.join(base, "restored", "prooflight.db"), uploadsDir: path.join(base, "restored", "uploads") };
    const checks = await restoreBackup(path.join(base, "backup"), target);
    expect(checks.filter((c) => !c.ok)).toEqual([]);
    // One check per upload before copying, one per upload after, the database, and the audit chain.
    expect(checks).toHaveLength(2 * manifest.blobs.length + 2);
    const restored = openDatabaseFile(target.databaseFile);
    const comments = Number((await restored.client.execute("SELECT count(*) FROM comments")).rows[0]![0]);
    const audit = Number((await restored.client.execute("SELECT count(*) FROM audit_log")).rows[0]![0]);
    const versions = Number((await restored.client.execute("SELECT count(*) FROM versions")).rows[0]![0]);
    restored.client.close();
    expect(comments).toBeGreaterThanOrEqual(commentsBefore + 5);
    expect(comments).toBeLessThanOrEqual(commentsAfter);
    expect(audit).toBe(manifest.audit.entries);
    expect(versions).toBe(await count("SELECT count(*) FROM versions"));
  });

  it("refuses to restore over an existing database", async () => {
    const target = { databaseFile: path.join(base, "restored", "prooflight.db"), uploadsDir: path.join(base, "elsewhere") };
    await expect(restoreBackup(path.join(base, "backup"), target)).rejects.toThrow(/prooflight\.db exists: restore only into an empty location\.$/);
  });

  it("a damaged upload in the backup restores nothing and names the file", async () => {
    const copy = path.join(base, "damaged");
    fs.cpSync(path.join(base, "backup"), copy, { recursive: true });
    const victim = manifest.blobs[0]!.sha256;
    const file = path.join(copy, "blobs", victim.slice(0, 2), victim.slice(2, 4), victim);
    fs.chmodSync(file, 0o644);
    fs.appendFileSync(file, "x");
    const target = { databaseFile: path.join(base, "second", "prooflight.db"), uploadsDir: path.join(base, "second", "uploads") };
    await expect(restoreBackup(copy, target)).rejects.toThrow(new RegExp(`^The backup is damaged; nothing was restored: upload ${victim.slice(0, 12)} \\(`));
    expect(fs.existsSync(path.join(base, "second"))).toBe(false);
  });

  it("refuses a folder that is not empty as a backup target", async () => {
    await expect(createBackup(path.join(base, "backup"))).rejects.toThrow(/is not empty: choose a new or empty folder\.$/);
  });
});
