import { gunzipSync } from "node:zlib";
import { createClient, type Client } from "@libsql/client";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import * as manuscript from "@/app/api/manuscripts/[id]/route";
import { seedDemoWithData } from "@/lib/server/demo/seed-demo";
import { setupTestApp, type Who } from "./harness";

/** GET /api/manuscripts/{id} is serialised and compressed once per kept overview and caller's role. */
let tokens: Record<Who, string>;
let other: Client;
beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  await seedDemoWithData();
  other = createClient({ url: process.env.DATABASE_URL! });
});
afterAll(() => other.close());

async function read(who: Who, acceptEncoding?: string) {
  const headers = new Headers({ authorization: `Bearer ${tokens[who]}` });
  if (acceptEncoding) headers.set("accept-encoding", acceptEncoding);
  const res = await manuscript.GET!(new Request(`http://localhost:3000/api/manuscripts/${DEMO_MANUSCRIPT_ID}`, { headers }), {
    params: Promise.resolve({ id: DEMO_MANUSCRIPT_ID }),
  });
  expect(res.status).toBe(200);
  const bytes = Buffer.from(await res.arrayBuffer());
  const text = (res.headers.get("content-encoding") === "gzip" ? gunzipSync(bytes) : bytes).toString("utf8");
  return { json: JSON.parse(text), encoding: res.headers.get("content-encoding") };
}

describe("the manuscript overview kept as an answer", () => {
  it("each member gets their own role, read after read", async () => {
    const roles: Array<[Who, string]> = [
      ["pi", "pi"],
      ["author", "author"],
      ["reviewer", "reviewer"],
      ["viewer", "viewer"],
    ];
    for (let round = 0; round < 2; round++)
      for (const [who, role] of roles) {
        const { json } = await read(who);
        expect(json.role).toBe(role);
        expect(new Set(json.figures.map((f: any) => f.role))).toEqual(new Set([role]));
      }
  });

  it("gzip when asked, the same overview either way", async () => {
    const plain = await read("pi");
    const zipped = await read("pi", "gzip, deflate");
    expect(plain.encoding).toBeNull();
    expect(zipped.encoding).toBe("gzip");
    expect(zipped.json).toEqual(plain.json);
  });

  it("the manuscript's own title, changed elsewhere without touching the overview, shows on the next read", async () => {
    await read("pi", "gzip");
    await other.execute({ sql: "UPDATE manuscripts SET title = ? WHERE id = ?", args: ["Retitled by a script", DEMO_MANUSCRIPT_ID] });
    expect((await read("pi", "gzip")).json.title).toBe("Retitled by a script");
    expect((await read("viewer")).json.title).toBe("Retitled by a script");
  });
});
