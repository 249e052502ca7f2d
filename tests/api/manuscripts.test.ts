import { beforeAll, describe, expect, it } from "vitest";
import { DEMO_MANUSCRIPT_ID, OTHER_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import * as me from "@/app/api/me/route";
import * as manuscripts from "@/app/api/manuscripts/route";
import * as manuscript from "@/app/api/manuscripts/[id]/route";
import * as members from "@/app/api/manuscripts/[id]/members/route";
import * as member from "@/app/api/manuscripts/[id]/members/[userId]/route";
import * as health from "@/app/api/health/route";
import * as openapi from "@/app/api/openapi.json/route";
import { call, setupTestApp, type Who } from "./harness";

let tokens: Record<Who, string>;
beforeAll(async () => {
  ({ tokens } = await setupTestApp());
});

describe("manuscripts API", () => {
  it("health answers ok once migrations are applied", async () => {
    const r = await call(health.GET);
    expect(r).toMatchObject({ status: 200, json: { ok: true } });
  });

  it("/api/me names the caller and their memberships", async () => {
    const r = await call(me.GET, { token: tokens.reviewer });
    expect(r.status).toBe(200);
    expect(r.json.email).toBe("reviewer@partner.example.org");
    expect(r.json.memberships).toEqual([{ manuscriptId: DEMO_MANUSCRIPT_ID, role: "reviewer" }]);
  });

  it("401 without a token, 401 with a wrong one", async () => {
    expect((await call(me.GET, { token: null, headers: { authorization: "Bearer nope" } })).status).toBe(401);
  });

  it("each demo user lists exactly their manuscripts", async () => {
    const ids = async (who: Who) => (await call(manuscripts.GET, { token: tokens[who] })).json.items.map((m: any) => m.id);
    for (const who of ["pi", "author", "reviewer", "viewer"] as const) expect(await ids(who)).toEqual([DEMO_MANUSCRIPT_ID]);
    expect(await ids("outsider")).toEqual([OTHER_MANUSCRIPT_ID]);
  });

  it("the outsider gets 404 on the demo manuscript, members get it", async () => {
    expect((await call(manuscript.GET, { token: tokens.outsider, params: { id: DEMO_MANUSCRIPT_ID } })).status).toBe(404);
    const r = await call(manuscript.GET, { token: tokens.viewer, params: { id: DEMO_MANUSCRIPT_ID } });
    expect(r.status).toBe(200);
    expect(r.json).toMatchObject({ id: DEMO_MANUSCRIPT_ID, role: "viewer", figures: [] });
    expect(r.json.members).toHaveLength(4);
  });

  it("creates a manuscript in the caller's lab and makes them PI", async () => {
    const r = await call(manuscripts.POST, { method: "POST", token: tokens.author, body: { title: "Spin-lock NMR at low field" } });
    expect(r.status).toBe(201);
    expect(r.json.role).toBe("pi");
    expect(r.json.members.map((m: any) => m.email)).toEqual(["author@lab.example.org"]);
  });

  it("the reviewer, in no lab, cannot create a manuscript without naming a lab", async () => {
    const r = await call(manuscripts.POST, { method: "POST", token: tokens.reviewer, body: { title: "x" } });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toMatch(/labId/);
    const other = await call(manuscripts.POST, { method: "POST", token: tokens.reviewer, body: { title: "x", labId: "demo-lab" } });
    expect(other.status).toBe(404);
  });

  it("bad input names the field and never gives a 500", async () => {
    const r = await call(manuscripts.POST, { method: "POST", token: tokens.pi, body: { title: "" } });
    expect(r.status).toBe(400);
    expect(r.json.error.details[0].path).toBe("title");
    const bad = await call(manuscripts.POST, { method: "POST", token: tokens.pi, body: "{not json" });
    expect(bad.status).toBe(400);
    expect(bad.json.error.message).toMatch(/not valid JSON/);
  });

  it("PI invites; the others cannot; a duplicate member is a 409", async () => {
    const params = { id: DEMO_MANUSCRIPT_ID };
    const ok = await call(members.POST, { method: "POST", token: tokens.pi, params, body: { email: "New.Person@Partner.example.org", role: "reviewer" } });
    expect(ok.status).toBe(201);
    expect(ok.json).toMatchObject({ email: "new.person@partner.example.org", role: "reviewer", status: "invited" });
    expect((await call(members.POST, { method: "POST", token: tokens.author, params, body: { email: "a@b.org", role: "viewer" } })).status).toBe(403);
    expect((await call(members.POST, { method: "POST", token: tokens.outsider, params, body: { email: "a@b.org", role: "viewer" } })).status).toBe(404);
    const dup = await call(members.POST, { method: "POST", token: tokens.pi, params, body: { email: "viewer@lab.example.org", role: "viewer" } });
    expect(dup.status).toBe(409);
    const badRole = await call(members.POST, { method: "POST", token: tokens.pi, params, body: { email: "c@d.org", role: "boss" } });
    expect(badRole.status).toBe(400);
    expect(badRole.json.error.message).toMatch(/^role:/);
  });

  it("a manuscript always keeps at least one PI", async () => {
    const params = { id: DEMO_MANUSCRIPT_ID, userId: "demo-pi" };
    const r = await call(member.PATCH, { method: "PATCH", token: tokens.pi, params, body: { role: "author" } });
    expect(r.status).toBe(409);
    expect((await call(member.DELETE, { method: "DELETE", token: tokens.pi, params })).status).toBe(409);
    // Promote the author, then the original PI may step down.
    expect((await call(member.PATCH, { method: "PATCH", token: tokens.pi, params: { ...params, userId: "demo-author" }, body: { role: "pi" } })).status).toBe(
      200,
    );
    expect((await call(member.PATCH, { method: "PATCH", token: tokens.pi, params, body: { role: "author" } })).status).toBe(200);
    expect((await call(member.PATCH, { method: "PATCH", token: tokens.author, params, body: { role: "pi" } })).status).toBe(200);
    expect(
      (await call(member.PATCH, { method: "PATCH", token: tokens.pi, params: { ...params, userId: "demo-author" }, body: { role: "author" } })).status,
    ).toBe(200);
  });

  it("publishes an OpenAPI 3.1 document with the request schemas", async () => {
    const r = await call(openapi.GET);
    expect(r.json.openapi).toBe("3.1.0");
    const post = r.json.paths["/api/manuscripts/{id}/members"].post;
    expect(post.requestBody.content["application/json"].schema.properties.role.enum).toEqual(["pi", "author", "reviewer", "viewer"]);
  });
});
