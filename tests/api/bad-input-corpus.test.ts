// The bad-input corpus (tests/fixtures/bad/*.json): every case is refused with the 4xx its fixture names,
// a JSON error whose message matches the fixture's regex, and nothing half written — no row added,
// changed or removed (only rate_events and sign_in_failures may grow), no audit entry, no file left
// under uploads/. A few uploads are accepted inert (201) and checked for what exactly was stored.
// Expected statuses and messages are written by hand in the fixtures; `knownIssue` marks a case that
// fails today on purpose (the app is wrong, not the fixture).
import { createHash } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq, like } from "drizzle-orm";
import { getClient, getDb } from "@/db/client";
import { rateEvents } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID, OTHER_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { resetEnvForTests } from "@/lib/env";
import { API_OPERATIONS } from "@/lib/http/api-catalogue";
import type { RouteHandler } from "@/lib/http/route";
import { plainDoc } from "@/lib/review/rich-text";
import { call, setupTestApp, type Who } from "./harness";
import { routeFiles } from "./route-files";

// A request carrying a session cookie is the demo author (see cookie-caller.ts).
vi.mock("@/lib/http/request-user", () => import("./cookie-caller").then((m) => m.cookieCallerModule()));

type Part = string | { repeat: string; times: number } | { hex: string };
interface UploadPart {
  name: string;
  fileName?: string;
  value?: string;
  content?: string;
  contentParts?: Part[];
  file?: string;
}
interface Upload {
  fileName?: string;
  content?: string;
  contentParts?: Part[];
  file?: string;
  fields?: Record<string, string>;
  parts?: UploadPart[];
}
interface Accepted {
  fileName?: string;
  warning?: string;
  mustNotExist?: string[];
  cell?: { column: string; row: number; text: string };
}
interface Case {
  id: string;
  category: string;
  route: string;
  who: Who | "anonymous";
  params?: Record<string, string>;
  query?: string;
  headers?: Record<string, string>;
  cookie?: boolean;
  body?: unknown;
  raw?: Part | Part[];
  upload?: Upload;
  status: number;
  message?: string;
  knownIssue?: string;
  accepted?: Accepted;
  env?: Record<string, string>;
  prefill?: { bucket: string; count: number };
}

const FIXTURES = path.resolve(__dirname, "../fixtures/bad");
const FILES = ["cases.json", "bodies.json", "specs.json", "comments.json", "queries.json", "headers.json", "rate-limits.json"];
const isObj = (v: unknown): v is Record<string, any> => v !== null && typeof v === "object" && !Array.isArray(v);

/** A fixture's cases with its defaults applied (a default body is merged key by key) and its route × case matrix spelled out. */
function load(file: string): Case[] {
  const f = JSON.parse(fs.readFileSync(path.join(FIXTURES, file), "utf8"));
  const withDefaults = (c: any, d: any = {}): Case => {
    const own = c.body;
    const body =
      isObj(own) && own.$omit
        ? undefined
        : isObj(d.body) && isObj(own)
          ? { ...d.body, ...own }
          : (own ?? (c.raw === undefined && c.upload === undefined ? d.body : undefined));
    return { ...d, ...c, body, category: f.category };
  };
  const cases = (f.cases as any[]).map((c) => withDefaults(c, f.defaults));
  const m = f.everyWriteRoute;
  if (m)
    for (const r of m.routes)
      for (const g of m.cases)
        cases.push(withDefaults({ ...g, ...r.overrides?.[g.id], id: `${r.route}: ${g.id}`, route: r.route, who: r.who, params: r.params }));
  return cases;
}
const CASES = FILES.flatMap(load);

let tokens: Record<Who, string>;
let dir: string;
const ids: Record<string, string> = { manuscriptId: DEMO_MANUSCRIPT_ID, otherManuscriptId: OTHER_MANUSCRIPT_ID };

/** Fills in `{{name}}` and the generators `$repeat`, `$array`, `$object`, `$concat`, `$json`; drops `$omit` keys. */
function expand(v: unknown): any {
  if (typeof v === "string")
    return v.replace(/\{\{(\w+)\}\}/g, (_, k: string) => {
      if (!(k in ids)) throw new Error(`no fixture id {{${k}}}`);
      return ids[k]!;
    });
  if (Array.isArray(v)) return v.map(expand);
  if (!isObj(v)) return v;
  if ("$repeat" in v) return String(expand(v.$repeat)).repeat(v.times);
  if ("$array" in v) return Array.from({ length: v.times }, () => expand(v.$array));
  if ("$object" in v) return Object.fromEntries(Array.from({ length: v.times }, (_, i) => [`${expand(v.$object)}${i + 1}`, expand(v.value)]));
  if ("$concat" in v) return (v.$concat as unknown[]).map(expand).join("");
  if ("$json" in v) return JSON.stringify(expand(v.$json));
  return Object.fromEntries(
    Object.entries(v)
      .filter(([, x]) => !(isObj(x) && x.$omit))
      .map(([k, x]) => [k, expand(x)]),
  );
}

function bytes(parts: Part | Part[]): Uint8Array {
  const chunks = (Array.isArray(parts) ? parts : [parts]).map((p) =>
    typeof p === "string"
      ? new TextEncoder().encode(expand(p))
      : "hex" in p
        ? Uint8Array.from(Buffer.from(p.hex.replace(/\s/g, ""), "hex"))
        : new TextEncoder().encode(expand(p.repeat).repeat(p.times)),
  );
  return new Uint8Array(Buffer.concat(chunks));
}

function fileBytes(p: { content?: string; contentParts?: Part[]; file?: string }): Uint8Array {
  if (p.file) return new Uint8Array(fs.readFileSync(path.join(FIXTURES, p.file)));
  return p.contentParts ? bytes(p.contentParts) : new TextEncoder().encode(p.content ?? "");
}

function form(u: Upload): FormData {
  const parts: UploadPart[] = u.parts ?? [...Object.entries(u.fields ?? {}).map(([name, value]) => ({ name, value })), { name: "file", ...u }];
  const f = new FormData();
  for (const p of parts) {
    if (p.value !== undefined) f.append(p.name, expand(p.value));
    else f.append(p.name, new Blob([fileBytes(p) as BlobPart]), expand(p.fileName ?? "upload.csv"));
  }
  return f;
}

const handlers = new Map<string, string>(routeFiles().map((r) => [r.apiPath, r.file]));
async function handlerFor(route: string): Promise<RouteHandler> {
  const [method, apiPath] = route.split(" ") as [string, string];
  expect(
    API_OPERATIONS.some((op) => `${op.method} ${op.path}` === route),
    `${route} is not in the API catalogue`,
  ).toBe(true);
  return (await import(handlers.get(apiPath)!))[method];
}

async function send(raw: Case) {
  const c = { ...raw, params: expand(raw.params ?? {}), headers: expand(raw.headers ?? {}) as Record<string, string> };
  const [method, apiPath] = c.route.split(" ") as [string, string];
  const urlPath = apiPath.replace(/\{(\w+)\}/g, (_, k: string) => encodeURIComponent(c.params[k] ?? k)) + (c.query ? `?${expand(c.query)}` : "");
  const headers = { ...c.headers };
  if (c.cookie) headers.cookie = "authjs.session-token=corpus";
  let rawBody: BodyInit | undefined;
  if (c.upload) rawBody = form(expand(c.upload));
  else if (c.raw !== undefined) {
    rawBody = bytes(c.raw) as BodyInit;
    if (!("content-type" in headers)) headers["content-type"] = "application/json";
    if (!headers["content-type"]) delete headers["content-type"];
  }
  const token = c.who === "anonymous" || c.cookie ? null : tokens[c.who];
  return call(await handlerFor(c.route), {
    method,
    path: urlPath,
    token,
    params: c.params,
    headers,
    rawBody,
    body: c.body === undefined ? undefined : expand(c.body),
  });
}

// Only these may change when a request is refused: rate limits count attempts, sign-in failures count failures.
const GROWS = new Set(["rate_events", "sign_in_failures"]);
// Compared by count only: the mail outbox is delivered in the background. (Token use stamps api_tokens.last_used_at: left out.)
const COUNT_ONLY = new Set(["mail_outbox"]);

/** Every table's row count and content hash, and every file under uploads/. */
async function snapshot() {
  const client = getClient();
  const names = (await client.execute("select name from sqlite_master where type = 'table' order by name")).rows.map((r) => String(r.name));
  const tables: Record<string, string> = {};
  for (const name of names.filter((n) => !GROWS.has(n))) {
    const rs = await client.execute(`select * from "${name}"`);
    const rows = rs.rows
      .map((r) => rs.columns.filter((col) => col !== "last_used_at").map((col) => r[col]))
      .filter((r) => name !== "sqlite_sequence" || !GROWS.has(String(r[0])));
    const digest = createHash("sha256")
      .update(JSON.stringify(rows, (_, x) => (typeof x === "bigint" ? String(x) : x)))
      .digest("hex")
      .slice(0, 16);
    tables[name] = COUNT_ONLY.has(name) ? `${rows.length} rows` : `${rows.length} rows ${digest}`;
  }
  return { tables, files: walk(path.join(dir, "uploads")) };
}

function walk(root: string): string[] {
  if (!fs.existsSync(root)) return [];
  return (fs.readdirSync(root, { recursive: true }) as string[]).filter((p) => fs.statSync(path.join(root, p)).isFile()).sort();
}
const rowCount = (s: Awaited<ReturnType<typeof snapshot>>, t: string) => Number(s.tables[t]!.split(" ")[0]);

beforeAll(async () => {
  Object.assign(process.env, { UPLOAD_MAX_BYTES: String(256 * 1024), COMMENTS_PER_MINUTE: "1000000" });
  ({ tokens, dir } = await setupTestApp());
  const post = async (route: string, who: Who, params: Record<string, string>, body?: unknown, rawBody?: FormData) => {
    const r = await call(await handlerFor(route), { method: route.split(" ")[0], token: tokens[who], params, body, rawBody });
    expect(r.status, `${route}: ${JSON.stringify(r.json)}`).toBeLessThan(300);
    return r.json;
  };
  const upload = (who: Who, id: string, name: string, text: string, fields: Record<string, string> = {}) =>
    post("POST /api/manuscripts/{id}/datasets", who, { id }, undefined, form({ fileName: name, content: text, fields }));
  const echo = await upload("author", DEMO_MANUSCRIPT_ID, "echo.csv", "tau (µs),signal,label\n1,0.9,a\n2,0.8,b\n4,0.6,c\n");
  Object.assign(ids, { datasetId: echo.datasetId, versionId: echo.id });
  const t1 =
    "wait (ms),p\n" +
    Array.from({ length: 30 }, (_, i) => {
      const t = 0.05 * 1.25 ** i;
      return `${t},${(0.7 + 0.3 * Math.exp(-t / 4) + 0.002 * Math.sin(7 * i)).toFixed(5)}`;
    }).join("\n");
  ids.fitVersionId = (await upload("author", DEMO_MANUSCRIPT_ID, "t1.csv", t1, { metadata: JSON.stringify({ kind: "relaxation", tags: { group: "a" } }) })).id;
  ids.analysisId = (await post("POST /api/analyses", "author", {}, { versionId: ids.fitVersionId, model: "relaxation", options: { x: "wait", y: "p" } })).id;
  const theirs = await upload("outsider", OTHER_MANUSCRIPT_ID, "theirs.csv", "a,b\n1,2\n3,4\n");
  Object.assign(ids, { otherDatasetId: theirs.datasetId, otherVersionId: theirs.id });
  const spec = (name: string) => ({
    $schema: "https://vega.github.io/schema/vega-lite/v6.json",
    data: { name },
    mark: "point",
    encoding: { x: { field: name === "echo" ? "tau" : "a", type: "quantitative" }, y: { field: name === "echo" ? "signal" : "b", type: "quantitative" } },
  });
  ids.otherFigureId = (await post("POST /api/figures", "outsider", {}, { manuscriptId: OTHER_MANUSCRIPT_ID, title: "Theirs" })).id;
  ids.otherPanelId = (await post("POST /api/figures/{id}/panels", "outsider", { id: ids.otherFigureId }, {})).id;
  ids.otherRevisionId = (
    await post(
      "POST /api/panels/{id}/revisions",
      "outsider",
      { id: ids.otherPanelId },
      { spec: spec("theirs"), bindings: { theirs: { versionId: ids.otherVersionId } }, baseRevisionId: null },
    )
  ).id;
  ids.figureId = (await post("POST /api/figures", "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Corpus" })).id;
  ids.panelId = (await post("POST /api/figures/{id}/panels", "author", { id: ids.figureId }, {})).id;
  ids.panel2Id = (await post("POST /api/figures/{id}/panels", "author", { id: ids.figureId }, {})).id;
  const revise = (panel: string, base: string | null, message: string) =>
    post(
      "POST /api/panels/{id}/revisions",
      "author",
      { id: panel },
      { spec: spec("echo"), bindings: { echo: { versionId: ids.versionId } }, baseRevisionId: base, message },
    );
  ids.staleRevisionId = (await revise(ids.panelId, null, "first")).id;
  ids.revisionId = (await revise(ids.panelId, ids.staleRevisionId, "second")).id;
  ids.revision2Id = (await revise(ids.panel2Id, null, "other panel")).id;
  const thread = await post(
    "POST /api/panels/{id}/threads",
    "reviewer",
    { id: ids.panelId },
    { body: plainDoc("Is the baseline flat?"), revisionId: ids.revisionId },
  );
  Object.assign(ids, { threadId: thread.id, commentId: thread.comments[0].id });
  await post("POST /api/threads/{id}/comments", "author", { id: thread.id }, { body: plainDoc("It is.") });
  ids.figureHash = (await call(await handlerFor("GET /api/figures/{id}"), { token: tokens.pi, params: { id: ids.figureId } })).json.figureHash;
  ids.piTokenId = (await post("POST /api/tokens", "pi", {}, { name: "corpus" })).id;
  const revoked = await post("POST /api/tokens", "viewer", {}, { name: "revoked" });
  await call(await handlerFor("DELETE /api/tokens/{id}"), { method: "DELETE", token: tokens.viewer, params: { id: revoked.id } });
  Object.assign(ids, { revokedToken: revoked.token, revokedTokenId: revoked.id });
});

const ran: Record<string, number> = {};
afterAll(() => {
  const total = Object.values(ran).reduce((a, b) => a + b, 0);
  console.log(
    `bad-input corpus: ${Object.entries(ran)
      .map(([k, n]) => `${k} ${n}`)
      .join(", ")}; ${total} cases in all`,
  );
});

/** Status, error shape and message; then nothing written, nothing left in uploads/tmp. */
async function refused(c: Case) {
  // The upload limit of 120 an hour is not configurable; the corpus alone sends more than that.
  if (c.route.endsWith("/datasets") && !c.prefill) await getDb().delete(rateEvents).where(like(rateEvents.bucket, "upload:user:%"));
  const before = await snapshot();
  const r = await send(c);
  const detail = `${c.route} → ${r.status} ${JSON.stringify(r.json)?.slice(0, 600)}`;
  expect(r.status, detail).toBeLessThan(500);
  expect(r.status, detail).toBe(c.status);
  expect(r.json?.error, detail).toEqual(expect.objectContaining({ code: expect.any(String), message: expect.any(String) }));
  expect(r.json.error.message).toMatch(new RegExp(expand(c.message)));
  expect(walk(path.join(dir, "uploads", "tmp")), "uploads/tmp must be empty").toEqual([]);
  expect(await snapshot(), "nothing may be written by a refused request").toEqual(before);
  return r;
}

/** 201, and exactly one dataset, one version and one audit entry more; its blob and cache under uploads/, nothing elsewhere. */
async function acceptedInert(c: Case) {
  await getDb().delete(rateEvents).where(like(rateEvents.bucket, "upload:user:%"));
  const outside = () => walk(dir).filter((p) => !p.startsWith(`uploads${path.sep}`) && !p.startsWith("test.db"));
  const [before, beforeOutside] = [await snapshot(), outside()];
  const r = await send(c);
  expect(r.status, JSON.stringify(r.json)).toBe(201);
  const a = expand(c.accepted) as Accepted;
  const after = await snapshot();
  for (const t of Object.keys(before.tables))
    expect(rowCount(after, t), t).toBe(rowCount(before, t) + (["datasets", "versions", "audit_log"].includes(t) ? 1 : 0));
  const sha: string = r.json.sha256;
  const added = after.files.filter((f) => !before.files.includes(f));
  expect(
    added.every((f) => [path.join(sha.slice(0, 2), sha.slice(2, 4), sha), path.join("cache", `${sha}.columns`)].includes(f)),
    added.join(),
  ).toBe(true);
  expect(walk(path.join(dir, "uploads", "tmp"))).toEqual([]);
  expect(outside()).toEqual(beforeOutside);
  for (const p of a.mustNotExist ?? []) expect(fs.existsSync(path.resolve(dir, "uploads", p)), p).toBe(false);
  if (a.fileName !== undefined) expect(r.json.fileName).toBe(a.fileName);
  if (a.warning) expect(r.json.warnings).toEqual(expect.arrayContaining([expect.stringMatching(new RegExp(a.warning))]));
  if (a.cell) {
    const rows = await call(await handlerFor("GET /api/versions/{id}/rows"), { token: tokens.viewer, params: { id: r.json.id } });
    const j = rows.json.columns.findIndex((col: { name: string }) => col.name === a.cell!.column);
    expect(rows.json.columns[j]).toMatchObject({ name: a.cell.column, type: "string" });
    expect(rows.json.rows[a.cell.row][j]).toBe(a.cell.text);
  }
}

const title = (c: Case) => `${c.id}${c.knownIssue ? ` [known issue: ${c.knownIssue}]` : ""}`;
for (const category of [...new Set(CASES.map((c) => c.category))].filter((k) => k !== "rate-limits")) {
  describe(category, () => {
    it.each(CASES.filter((c) => c.category === category).map((c) => [title(c), c] as const))("%s", async (_, c) => {
      const key = c.accepted ? "accepted inert" : category;
      ran[key] = (ran[key] ?? 0) + 1;
      if (c.accepted) await acceptedInert(c);
      else await refused(c);
    });
  });
}

describe("rate limits (a limit lowered or its bucket filled): 429 with Retry-After, nothing written", () => {
  it.each(CASES.filter((c) => c.category === "rate-limits").map((c) => [title(c), c] as const))("%s", async (_, c) => {
    ran["rate-limits"] = (ran["rate-limits"] ?? 0) + 1;
    const at = new Date(Date.now() - 1000);
    const saved = Object.fromEntries(Object.keys(c.env ?? {}).map((k) => [k, process.env[k]]));
    Object.assign(process.env, c.env);
    resetEnvForTests();
    await getDb().delete(rateEvents).where(eq(rateEvents.bucket, c.prefill!.bucket));
    await getDb()
      .insert(rateEvents)
      .values(Array.from({ length: c.prefill!.count }, () => ({ bucket: c.prefill!.bucket, at })));
    try {
      const r = await refused(c);
      expect(r.headers.get("retry-after")).toMatch(/^[1-9]\d*$/);
    } finally {
      for (const [k, v] of Object.entries(saved))
        if (v === undefined) delete process.env[k];
        else process.env[k] = v;
      resetEnvForTests();
      await getDb().delete(rateEvents).where(eq(rateEvents.bucket, c.prefill!.bucket));
    }
  });
});

describe("the corpus", () => {
  it("holds at least 300 cases that must be refused with a 4xx, every one with a message to match", () => {
    const refusals = CASES.filter((c) => !c.accepted);
    expect(refusals.every((c) => c.status >= 400 && c.status < 500 && typeof c.message === "string")).toBe(true);
    expect(refusals.length).toBeGreaterThanOrEqual(300);
    expect(CASES.filter((c) => c.accepted).every((c) => c.status === 201 && !c.message)).toBe(true);
    expect(new Set(CASES.map((c) => c.id)).size).toBe(CASES.length);
  });
});
