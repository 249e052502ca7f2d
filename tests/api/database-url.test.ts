// DATABASE_URL may name a libSQL server instead of a file: the same client module then speaks the
// server's HTTP protocol (Hrana over HTTP, POST /v2/pipeline) with DATABASE_AUTH_TOKEN as a bearer
// token. No libSQL server installs from npm or Debian here, so a stand-in answers one statement the
// way the protocol specifies (https://github.com/tursodatabase/libsql/blob/main/docs/HRANA_2_SPEC.md,
// from memory); the services themselves are not run against it.
import http from "node:http";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, getClient } from "@/db/client";
import { resetEnvForTests } from "@/lib/env";

const seen: Array<{ method: string; url: string; authorization: string | undefined; body: string }> = [];
const server = http.createServer((req, res) => {
  let body = "";
  req.on("data", (c: Buffer) => (body += c.toString()));
  req.on("end", () => {
    seen.push({ method: req.method!, url: req.url!, authorization: req.headers.authorization, body });
    if (req.url !== "/v2/pipeline") {
      res.statusCode = 404;
      return res.end();
    }
    res.setHeader("content-type", "application/json");
    res.end(
      JSON.stringify({
        baton: null,
        base_url: null,
        results: [
          {
            type: "ok",
            response: {
              type: "execute",
              result: { cols: [{ name: "n", decltype: null }], rows: [[{ type: "integer", value: "7" }]], affected_row_count: 0, last_insert_rowid: null },
            },
          },
          { type: "ok", response: { type: "close" } },
        ],
      }),
    );
  });
});

const saved = { url: process.env.DATABASE_URL, token: process.env.DATABASE_AUTH_TOKEN };
beforeAll(async () => {
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
});
afterAll(async () => {
  closeDb();
  for (const [k, v] of [
    ["DATABASE_URL", saved.url],
    ["DATABASE_AUTH_TOKEN", saved.token],
  ] as const)
    if (v === undefined) delete process.env[k];
    else process.env[k] = v;
  resetEnvForTests();
  await new Promise<void>((resolve) => server.close(() => resolve()));
});

describe("DATABASE_URL naming a libSQL server", () => {
  it("sends statements over HTTP with the auth token, through the same client module", async () => {
    process.env.DATABASE_URL = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    process.env.DATABASE_AUTH_TOKEN = "lab-token";
    resetEnvForTests();
    closeDb();
    const client = getClient();
    expect(client.protocol).toBe("http");
    const rs = await client.execute("SELECT 7 AS n");
    expect(rs.rows.map((r) => Number(r.n))).toEqual([7]);
    expect(seen).toHaveLength(1);
    expect(seen[0]).toMatchObject({ method: "POST", url: "/v2/pipeline", authorization: "Bearer lab-token" });
    expect(JSON.parse(seen[0]!.body).requests[0]).toMatchObject({ type: "execute", stmt: { sql: "SELECT 7 AS n" } });
  });
});
