import { beforeAll, describe, expect, it, vi } from "vitest";
import { handlers } from "@/auth";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { plainDoc } from "@/lib/review/rich-text";
import * as signInLink from "@/app/api/sign-in-link/route";
import * as authRoute from "@/app/api/auth/[...nextauth]/route";
import * as upload from "@/app/api/manuscripts/[id]/datasets/route";
import * as dataset from "@/app/api/datasets/[id]/route";
import * as figuresRoute from "@/app/api/figures/route";
import * as figure from "@/app/api/figures/[id]/route";
import * as panelsRoute from "@/app/api/figures/[id]/panels/route";
import * as revisions from "@/app/api/panels/[id]/revisions/route";
import * as threads from "@/app/api/panels/[id]/threads/route";
import * as reply from "@/app/api/threads/[id]/comments/route";
import * as comment from "@/app/api/comments/[id]/route";
import type { RouteHandler } from "@/lib/http/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let datasetId: string, versionId: string, figureId: string, panelId: string, revisionId: string, threadId: string, commentId: string;

const SPEC = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  mark: "point",
  encoding: { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative" } },
};
const post = (h: RouteHandler, who: Who, params: Record<string, string>, body: unknown) => call(h, { method: "POST", token: tokens[who], params, body });

beforeAll(async () => {
  ({ tokens } = await setupTestApp());
  const v = (
    await call(upload.POST, {
      method: "POST",
      token: tokens.author,
      params: { id: DEMO_MANUSCRIPT_ID },
      rawBody: uploadForm("echo.csv", "tau (µs),signal\n1,0.9\n2,0.8\n"),
    })
  ).json;
  datasetId = v.datasetId;
  versionId = v.id;
  figureId = (await post(figuresRoute.POST, "author", {}, { manuscriptId: DEMO_MANUSCRIPT_ID, title: "Coherence" })).json.id;
  panelId = (await post(panelsRoute.POST, "author", { id: figureId }, {})).json.id;
  revisionId = (
    await post(revisions.POST, "author", { id: panelId }, { spec: SPEC, bindings: { echo: { versionId } }, baseRevisionId: null, message: "first" })
  ).json.id;
  const t = (await post(threads.POST, "reviewer", { id: panelId }, { body: plainDoc("first"), revisionId })).json;
  threadId = t.id;
  commentId = t.comments[0].id;
});

/** A body that arrives in 64 KiB chunks without a Content-Length, counting how many chunks were pulled. */
function chunkedBody(totalChunks: number, first = '{"email":"a@b.example","pad":"') {
  const chunk = new Uint8Array(64 * 1024).fill(0x61);
  const stats = { pulled: 0, cancelled: false };
  const stream = new ReadableStream<Uint8Array>(
    {
      pull(controller) {
        stats.pulled++;
        if (stats.pulled === 1) controller.enqueue(new TextEncoder().encode(first));
        else if (stats.pulled <= totalChunks) controller.enqueue(chunk);
        else controller.close();
      },
      cancel() {
        stats.cancelled = true;
      },
    },
    { highWaterMark: 0 },
  );
  return { stream, stats };
}

async function callStream(handler: RouteHandler, path: string, stream: ReadableStream<Uint8Array>, headers: Record<string, string>) {
  const req = new Request(`http://localhost:3000${path}`, { method: "POST", headers, body: stream, duplex: "half" } as RequestInit);
  expect(req.headers.get("content-length")).toBeNull();
  const res = await handler(req, { params: Promise.resolve({}) });
  const text = await res.text();
  return { status: res.status, json: text ? JSON.parse(text) : null };
}

/** `{"a":{"a":…}}` nested `depth` levels. */
const nestedObject = (depth: number) => `${'{"a":'.repeat(depth)}1${"}".repeat(depth)}`;

describe("request bodies are capped while streaming", () => {
  it("a 2 MB body to the sign-in link endpoint is refused with 413 naming the limit", async () => {
    const r = await call(signInLink.POST, {
      method: "POST",
      path: "/api/sign-in-link",
      body: JSON.stringify({ email: "author@lab.example.org", pad: "x".repeat(2 * 1024 * 1024) }),
    });
    expect(r.status).toBe(413);
    expect(r.json.error).toEqual({ code: "too_large", message: "The request body is larger than the limit of 1 MB (1,048,576 bytes)." });
  });

  it("a Content-Length over the cap is refused before a byte is read", async () => {
    const { stream, stats } = chunkedBody(1000);
    const req = new Request("http://localhost:3000/api/sign-in-link", {
      method: "POST",
      headers: { "content-type": "application/json", "content-length": "5000000" },
      body: stream,
      duplex: "half",
    } as RequestInit);
    const res = await signInLink.POST(req, { params: Promise.resolve({}) });
    expect(res.status).toBe(413);
    expect(stats.pulled).toBe(0);
  });

  it("a chunked body over the cap is refused with 413, and the rest of the stream is not read", async () => {
    const { stream, stats } = chunkedBody(1000);
    const r = await callStream(signInLink.POST, "/api/sign-in-link", stream, { "content-type": "application/json" });
    expect(r.status).toBe(413);
    expect(r.json.error.message).toBe("The request body is larger than the limit of 1 MB (1,048,576 bytes).");
    // 1 MiB is 16 chunks of 64 KiB plus the opening chunk; the 18th chunk passes the cap.
    expect(stats.pulled).toBeLessThanOrEqual(18);
    expect(stats.cancelled).toBe(true);
  });

  it("a chunked body under the cap is read whole", async () => {
    const { stream } = chunkedBody(3, '{"email":"not-an-address","pad":"');
    const closing = new TextEncoder().encode('"}');
    const joined = stream.pipeThrough(
      new TransformStream<Uint8Array, Uint8Array>({
        flush(c) {
          c.enqueue(closing);
        },
      }),
    );
    const r = await callStream(signInLink.POST, "/api/sign-in-link", joined, { "content-type": "application/json" });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe("email: Give a valid e-mail address.");
  });

  it("token-authenticated routes are capped too; a revision may carry up to 2 MB", async () => {
    // Pretty-printed specs are mostly whitespace: 1.5 MB of it is within the revision route's 2 MB.
    const padded = (spaces: number) =>
      `{${" ".repeat(spaces)}${JSON.stringify({ spec: SPEC, bindings: { echo: { versionId } }, baseRevisionId: revisionId, message: "padded" }).slice(1)}`;
    const rev = await call(revisions.POST, { method: "POST", token: tokens.author, params: { id: panelId }, body: padded(1536 * 1024) });
    expect(rev.status).toBe(201);
    expect(rev.json.message).toBe("padded");
    const tooBig = await call(revisions.POST, { method: "POST", token: tokens.author, params: { id: panelId }, body: padded(2 * 1024 * 1024) });
    expect(tooBig.status).toBe(413);
    expect(tooBig.json.error.message).toBe("The request body is larger than the limit of 2 MB (2,097,152 bytes).");
    const reply1 = await post(reply.POST, "author", { id: threadId }, { body: plainDoc("y".repeat(1536 * 1024)) });
    expect(reply1.status).toBe(413);
  });

  it("the Auth.js endpoint refuses bodies over 64 kB, by Content-Length and by counting", async () => {
    const form = new URLSearchParams({ email: "author@lab.example.org", password: "p".repeat(70 * 1024) });
    const r = await call(authRoute.POST, {
      method: "POST",
      path: "/api/auth/callback/password",
      rawBody: form,
      headers: { "content-type": "application/x-www-form-urlencoded" },
    });
    expect(r.status).toBe(413);
    expect(r.json.error.message).toBe("The request body is larger than the limit of 64 kB (65,536 bytes).");
    const { stream, stats } = chunkedBody(1000, "email=author%40lab.example.org&password=");
    const s = await callStream(authRoute.POST, "/api/auth/callback/password", stream, { "content-type": "application/x-www-form-urlencoded" });
    expect(s.status).toBe(413);
    expect(s.json.error.message).toBe("The request body is larger than the limit of 64 kB (65,536 bytes).");
    expect(stats.pulled).toBeLessThanOrEqual(3);
    expect(stats.cancelled).toBe(true);
    const declared = chunkedBody(1000, "email=");
    const req = new Request("http://localhost:3000/api/auth/callback/password", {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded", "content-length": "70000" },
      body: declared.stream,
      duplex: "half",
    } as RequestInit);
    const d = await authRoute.POST(req, { params: Promise.resolve({}) });
    expect(d.status).toBe(413);
    expect(declared.stats.pulled).toBe(0);
  });

  it("a small Auth.js POST reaches Auth.js with its body, also when it arrives chunked", async () => {
    const seen: Array<{ body: string; path: string }> = [];
    const spy = vi.spyOn(handlers, "POST").mockImplementation((async (req: any) => {
      seen.push({ body: await req.text(), path: req.nextUrl.pathname });
      return new Response(null, { status: 204 });
    }) as never);
    try {
      const form = "csrfToken=abc&email=nobody%40lab.example.org";
      const r = await call(authRoute.POST, {
        method: "POST",
        path: "/api/auth/signin/nodemailer",
        rawBody: form,
        headers: { "content-type": "application/x-www-form-urlencoded" },
      });
      expect(r.status).toBe(204);
      const { stream } = chunkedBody(1, "csrfToken=abc&email=x%40y.example");
      const s = await callStream(authRoute.POST, "/api/auth/signin/nodemailer", stream, { "content-type": "application/x-www-form-urlencoded" });
      expect(s.status).toBe(204);
      expect(seen).toEqual([
        { body: "csrfToken=abc&email=nobody%40lab.example.org", path: "/api/auth/signin/nodemailer" },
        { body: "csrfToken=abc&email=x%40y.example", path: "/api/auth/signin/nodemailer" },
      ]);
    } finally {
      spy.mockRestore();
    }
  });
});

describe("JSON shape", () => {
  it("a body nested 10,000 levels deep is refused with 400 naming the limit", async () => {
    const r = await call(signInLink.POST, { method: "POST", path: "/api/sign-in-link", body: nestedObject(10_000) });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe(`The request body nests objects and arrays more than 64 levels deep (at ${Array(64).fill("a").join(".")}).`);
  });

  it("64 levels are fine", async () => {
    const r = await call(signInLink.POST, { method: "POST", path: "/api/sign-in-link", body: `{"email":"x","deep":${nestedObject(63)}}` });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe("email: Give a valid e-mail address.");
  });

  it("a __proto__ key anywhere is refused with 400 naming its path", async () => {
    const body = '{"body":{"type":"doc","content":[{"type":"paragraph","__proto__":{"polluted":true}}]}}';
    const r = await call(reply.POST, { method: "POST", token: tokens.author, params: { id: threadId }, body });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe('body.content[0].__proto__: "__proto__" is not allowed as a key in the request body.');
    const top = await call(signInLink.POST, { method: "POST", path: "/api/sign-in-link", body: '{"email":"author@lab.example.org","__proto__":{}}' });
    expect(top.status).toBe(400);
    expect(top.json.error.message).toBe('__proto__: "__proto__" is not allowed as a key in the request body.');
  });

  it("malformed JSON is a 400 naming line and column", async () => {
    const r = await call(signInLink.POST, { method: "POST", path: "/api/sign-in-link", body: '{\n  "email": "a@b.example",\n}' });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe('The request body is not valid JSON: line 3, column 1: unexpected "}" (expected a quoted name).');
  });

  it("a body that is not UTF-8 is a 400", async () => {
    const r = await call(signInLink.POST, {
      method: "POST",
      path: "/api/sign-in-link",
      rawBody: new Uint8Array([0x7b, 0x22, 0xff, 0x22, 0x3a, 0x31, 0x7d]),
      headers: { "content-type": "application/json" },
    });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe("The request body is not valid UTF-8 text.");
  });
});

describe("string fields have limits", () => {
  it("an e-mail address of 10,000 characters is refused", async () => {
    const r = await call(signInLink.POST, { method: "POST", path: "/api/sign-in-link", body: { email: `${"a".repeat(9_988)}@lab.example` } });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe("email: An e-mail address has at most 254 characters.");
  });

  it("a figure title of 10,000 characters is refused", async () => {
    const r = await call(figure.PATCH, { method: "PATCH", token: tokens.author, params: { id: figureId }, body: { title: "t".repeat(10_000) } });
    expect(r.status).toBe(400);
    expect(r.json.error.details[0].path).toBe("title");
  });
});

describe("PATCH with nothing to change", () => {
  it("PATCH /api/figures/{id} with {} is a 400 naming the fields", async () => {
    const r = await call(figure.PATCH, { method: "PATCH", token: tokens.author, params: { id: figureId }, body: {} });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe("(body): name at least one of title, widthMm, maxHeightMm, columns, shareYTitles, requiredReviewers to change.");
  });

  it("PATCH /api/datasets/{id} with {} is a 400 naming the fields", async () => {
    const r = await call(dataset.PATCH, { method: "PATCH", token: tokens.author, params: { id: datasetId }, body: {} });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe("(body): name at least one of kind, sample, instrument, measuredAt, notes, tags to change.");
  });

  it("a PATCH with a field still works", async () => {
    const r = await call(dataset.PATCH, { method: "PATCH", token: tokens.author, params: { id: datasetId }, body: { sample: "K17" } });
    expect(r.status).toBe(200);
    expect(r.json.sample).toBe("K17");
  });
});

describe("comment documents", () => {
  const blockquotes = (depth: number): unknown => {
    let node: unknown = { type: "paragraph", content: [{ type: "text", text: "deep" }] };
    for (let i = 0; i < depth; i++) node = { type: "blockquote", content: [node] };
    return { type: "doc", content: [node] };
  };

  it("a comment nested 10,000 levels deep is a 400, not a 500", async () => {
    // Built as text: JSON.stringify itself recurses and would overflow the stack here.
    const deep = `${'{"type":"blockquote","content":['.repeat(10_000)}{"type":"paragraph"}${"]}".repeat(10_000)}`;
    const body = `{"revisionId":${JSON.stringify(revisionId)},"body":{"type":"doc","content":[${deep}]}}`;
    const r = await call(threads.POST, { method: "POST", token: tokens.reviewer, params: { id: panelId }, body });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toMatch(/^The request body nests objects and arrays more than 64 levels deep \(at body\.content\[0\]\.content\[0\]/);
  });

  it("a comment within the body limit but nested past the document limit is refused with its path", async () => {
    const r = await post(reply.POST, "reviewer", { id: threadId }, { body: blockquotes(25) });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe(`body${".content[0]".repeat(20)}: nested more than 20 levels deep`);
  });

  it("unknown keys in a comment document are refused with their path, not stored", async () => {
    const body = { type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text: "hi", onclick: "alert(1)" }] }] };
    const r = await post(threads.POST, "reviewer", { id: panelId }, { body, revisionId });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe('body.content[0].content[0].onclick: "onclick" is not allowed on a text node');
    const attrs = {
      type: "doc",
      content: [{ type: "paragraph", content: [{ type: "text", text: "x", marks: [{ type: "link", attrs: { href: "https://example.org", style: "x" } }] }] }],
    };
    const e = await call(comment.PATCH, { method: "PATCH", token: tokens.reviewer, params: { id: commentId }, body: { body: attrs } });
    expect(e.status).toBe(400);
    expect(e.json.error.message).toBe('body.content[0].content[0].marks[0].attrs.style: "style" is not allowed on a link mark');
  });

  it("what the editor sends is still accepted", async () => {
    const body = {
      type: "doc",
      content: [
        {
          type: "paragraph",
          content: [
            { type: "text", text: "see " },
            {
              type: "text",
              text: "here",
              marks: [
                { type: "link", attrs: { href: "https://example.org", target: "_blank", rel: "noopener noreferrer nofollow", class: null, title: null } },
                { type: "bold" },
              ],
            },
            { type: "hardBreak" },
            { type: "mention", attrs: { id: "demo-author", label: "Tomás", mentionSuggestionChar: "@" } },
          ],
        },
        {
          type: "orderedList",
          attrs: { start: 1, type: null },
          content: [{ type: "listItem", content: [{ type: "paragraph", content: [{ type: "text", text: "one" }] }] }],
        },
        { type: "codeBlock", attrs: { language: null }, content: [{ type: "text", text: "x = 1" }] },
      ],
    };
    const r = await post(reply.POST, "reviewer", { id: threadId }, { body });
    expect(r.status).toBe(201);
  });
});

describe("dataset uploads", () => {
  it("a JSON upload nested 10,000 levels deep is a 400 naming line, column and the limit", async () => {
    const text = `{"t": [1, 2], "y": [${"[".repeat(10_000)}${"]".repeat(10_000)}, 1]}`;
    const r = await call(upload.POST, { method: "POST", token: tokens.author, params: { id: DEMO_MANUSCRIPT_ID }, rawBody: uploadForm("deep.json", text) });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe("deep.json, line 1, column 83: the JSON nests arrays and objects more than 64 levels deep.");
  });
});
