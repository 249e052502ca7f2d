import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { createClient, type Client } from "@libsql/client";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { cacheStatements, listsEveryColumn } from "@/db/statement-cache";

// Reused prepared statements must answer exactly what fresh ones would: the expected rows are written by hand.
let dir: string;
let client: Client;
beforeAll(async () => {
  cacheStatements();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-statements-"));
  client = createClient({ url: `file:${path.join(dir, "s.db")}` });
  await client.execute("CREATE TABLE t (id INTEGER PRIMARY KEY, v TEXT NOT NULL UNIQUE)");
});
afterAll(() => {
  client.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

const INSERT = "INSERT INTO t (id, v) VALUES (?, ?)";
const SELECT = "SELECT id, v FROM t WHERE id >= ? ORDER BY id";
const rows = async (from: number) => (await client.execute({ sql: SELECT, args: [from] })).rows.map((r) => [r.id, r.v]);

describe("prepared statements kept per connection", () => {
  it("the same SQL with other arguments, and after the table changed, reads the current rows", async () => {
    await client.execute({ sql: INSERT, args: [1, "one"] });
    expect(await rows(0)).toEqual([[1, "one"]]);
    await client.execute({ sql: INSERT, args: [2, "two"] });
    expect(await rows(0)).toEqual([
      [1, "one"],
      [2, "two"],
    ]);
    expect(await rows(2)).toEqual([[2, "two"]]);
  });

  it("a statement that failed (unique value) runs again with good arguments", async () => {
    await expect(client.execute({ sql: INSERT, args: [3, "one"] })).rejects.toThrow(/UNIQUE/);
    await client.execute({ sql: INSERT, args: [3, "three"] });
    expect(await rows(3)).toEqual([[3, "three"]]);
  });

  it("a query that failed while stepping rows runs again", async () => {
    const bad = "SELECT id, json_extract(v, '$.x') AS x FROM t WHERE id >= ?";
    await expect(client.execute({ sql: bad, args: [1] })).rejects.toThrow(/JSON/i);
    expect((await client.execute({ sql: bad, args: [99] })).rows).toEqual([]);
  });

  it("many requests at once with the same SQL each get their own answer", async () => {
    const answers = await Promise.all([3, 1, 2, 3, 1].map((from) => rows(from)));
    expect(answers.map((a) => a.length)).toEqual([1, 3, 2, 1, 3]);
  });

  it("a rolled-back transaction leaves nothing; a new connection after close reads the same rows", async () => {
    const tx = await client.transaction("write");
    await tx.execute({ sql: INSERT, args: [4, "four"] });
    await tx.rollback();
    expect((await rows(0)).length).toBe(3);
    const url = `file:${path.join(dir, "s.db")}`;
    client.close();
    client = createClient({ url });
    expect(await rows(0)).toEqual([
      [1, "one"],
      [2, "two"],
      [3, "three"],
    ]);
  });

  it("a SELECT * kept from before a column was added answers the new column too", async () => {
    await client.execute("CREATE TABLE w (id INTEGER PRIMARY KEY)");
    await client.execute("INSERT INTO w (id) VALUES (1)");
    expect((await client.execute("SELECT * FROM w")).columns).toEqual(["id"]);
    await client.execute("ALTER TABLE w ADD COLUMN note TEXT NOT NULL DEFAULT 'x'");
    const after = await client.execute("SELECT * FROM w");
    expect(after.columns).toEqual(["id", "note"]);
    expect(after.rows.map((r) => [r.id, r.note])).toEqual([[1, "x"]]);
  });

  it("a kept statement that returns no rows runs again and again, and reads stay rows", async () => {
    for (const id of [10, 11, 12]) expect((await client.execute({ sql: INSERT, args: [id, `n${id}`] })).rowsAffected).toBe(1);
    const read = await client.execute({ sql: SELECT, args: [11] });
    expect(read.columns).toEqual(["id", "v"]);
    expect(read.rows.map((r) => [r.id, r.v])).toEqual([
      [11, "n11"],
      [12, "n12"],
    ]);
  });
});

// Which statements are never kept: those whose columns are fixed by a wildcard when prepared.
describe("column wildcards", () => {
  it.each([
    ["SELECT * FROM w", true],
    ['select "w".* from "w"', true],
    ["select distinct * from w", true],
    ["select w.id, * from w", true],
    ["insert into t (id) values (?) returning *", true],
    ["select count(*), min(at) from rate_events", false],
    ["insert into c (id, created_at) values (?, (unixepoch('subsec') * 1000))", false],
    ["select a, b * 2 from t", false],
    ["select id from t where note = 'select *'", false],
    ["select id, v from t", false],
  ])("%s → %s", (sql, expected) => {
    expect(listsEveryColumn(sql)).toBe(expected);
  });
});
