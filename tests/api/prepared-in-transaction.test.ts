import path from "node:path";
import { createClient } from "@libsql/client";
import { count, eq, sql } from "drizzle-orm";
import { drizzle } from "drizzle-orm/libsql";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import * as schema from "@/db/schema";
import { rateEvents } from "@/db/schema";
import { setupTestApp } from "./harness";

/** A query built once runs on whichever connection its executor stands for: the database, a transaction of it, or another database. */
const insertEvent = preparedQuery((db) =>
  db
    .insert(rateEvents)
    .values({ bucket: sql.placeholder("bucket"), at: sql.placeholder("at") })
    .prepare(),
);
const eventsIn = preparedQuery((db) =>
  db
    .select({ n: count() })
    .from(rateEvents)
    .where(eq(rateEvents.bucket, sql.placeholder("bucket")))
    .prepare(),
);
const n = async (bucket: string, executor?: Parameters<typeof eventsIn>[0]) => (await eventsIn(executor).get({ bucket }))!.n;

let dir: string;
beforeAll(async () => {
  ({ dir } = await setupTestApp());
});

describe("prepared queries inside transactions", () => {
  it("run on the transaction's connection: seen inside, gone after a rollback", async () => {
    await getDb()
      .transaction(async (tx) => {
        await insertEvent(tx).run({ bucket: "prepared-rollback", at: new Date(1_700_000_000_000) });
        expect(await n("prepared-rollback", tx)).toBe(1);
        tx.rollback();
      })
      .catch((e: unknown) => expect(String(e)).toMatch(/Rollback/));
    expect(await n("prepared-rollback")).toBe(0);
  });

  it("a committed transaction keeps the row, with the timestamp it was given", async () => {
    await getDb().transaction(async (tx) => {
      await insertEvent(tx).run({ bucket: "prepared-commit", at: new Date(1_700_000_000_123) });
    });
    expect(await n("prepared-commit")).toBe(1);
    const [row] = await getDb().select().from(rateEvents).where(eq(rateEvents.bucket, "prepared-commit"));
    expect(row!.at.getTime()).toBe(1_700_000_000_123);
  });

  it("another database's handle gets the query built for it, not the app database's", async () => {
    const client = createClient({ url: `file:${path.join(dir, "other.db")}` });
    await client.execute("CREATE TABLE rate_events (id INTEGER PRIMARY KEY, bucket TEXT NOT NULL, at INTEGER NOT NULL)");
    const other = drizzle(client, { schema });
    await insertEvent(other).run({ bucket: "prepared-elsewhere", at: new Date(1_700_000_000_000) });
    await other.transaction(async (tx) => {
      await insertEvent(tx).run({ bucket: "prepared-elsewhere", at: new Date(1_700_000_000_001) });
    });
    expect(await n("prepared-elsewhere", other)).toBe(2);
    expect(await n("prepared-elsewhere")).toBe(0);
    client.close();
  });
});
