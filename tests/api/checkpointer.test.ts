import { createClient } from "@libsql/client";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Worker } from "node:worker_threads";
import { getClient } from "@/db/client";
import { startCheckpointer, type CheckpointReport } from "@/db/checkpointer";
import { setConnectionPragmas } from "@/db/statement-cache";
import { setupTestApp } from "./harness";

/** The write-ahead log is copied into the database file by a worker thread, not by the commit that fills it. */
let worker: Worker | null;
const reports: CheckpointReport[] = [];
let waiting: ((r: CheckpointReport) => void) | null = null;
const nextReport = () => new Promise<CheckpointReport>((resolve) => (waiting = resolve));

beforeAll(async () => {
  await setupTestApp();
  worker = startCheckpointer(process.env.DATABASE_URL!, (r) => {
    reports.push(r);
    waiting?.(r);
  });
});
afterAll(async () => {
  worker?.postMessage("stop");
  await new Promise((resolve) => worker?.once("exit", resolve));
  setConnectionPragmas([]);
});

describe("the checkpointer", () => {
  it("only for file databases", () => {
    expect(startCheckpointer("libsql://db.example.org")).toBeNull();
    expect(startCheckpointer("http://127.0.0.1:8080")).toBeNull();
  });

  it("copies what commits wrote into the database file", async () => {
    const client = getClient();
    await client.execute("CREATE TABLE IF NOT EXISTS ballast (id INTEGER PRIMARY KEY, fill TEXT NOT NULL)");
    const report = nextReport();
    for (let i = 0; i < 50; i++) await client.execute({ sql: "INSERT INTO ballast (fill) VALUES (?)", args: ["x".repeat(4000)] });
    const r = await report;
    expect(r.type).toBe("checkpoint");
    if (r.type === "checkpoint") {
      expect(r.log).toBeGreaterThan(0);
      expect(r.checkpointed).toBeGreaterThan(0);
    }
    expect(reports.filter((x) => x.type === "error")).toEqual([]);
  });

  it("connections opened after it started leave checkpoints to it up to the safety net", async () => {
    const fresh = createClient({ url: process.env.DATABASE_URL! });
    const [row] = (await fresh.execute("PRAGMA wal_autocheckpoint")).rows;
    fresh.close();
    expect(Number(Object.values(row!)[0])).toBe(10_000);
  });
});
