import { type APIRequestContext, type APIResponse } from "@playwright/test";
import { expect, test } from "./fixtures";
import { DEMO_MANUSCRIPT, signIn } from "./helpers";

// 50 clients post 20 comments each into one thread at the same time, against `next start`: all
// 1,000 stored, none twice, no 5xx. Five of the posts are sent again with the same clientKey once
// their first answer is in (a client retrying after a lost response): the retry must answer 201
// without storing a second comment. Each client is its own request context (own
// connections) carrying the reviewer's session cookie; cookie-authenticated writes must carry an
// Origin header, set explicitly on every request.
//
// Correctness only: nothing here depends on how fast the machine is. Throughput and latency under
// load are measured by the benchmark (`npm run bench -- review`, bench/review.ts: req/s and
// p50/p95/p99 of comment posts), never asserted in a test.

const CLIENTS = 50;
const PER_CLIENT = 20;
const RETRIED = new Set(["c7-3", "c12-0", "c25-19", "c33-10", "c49-7"]);
const SPEC = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "echo" },
  mark: "point",
  encoding: { x: { field: "tau", type: "quantitative" }, y: { field: "signal", type: "quantitative" } },
};

const doc = (text: string) => ({ type: "doc", content: [{ type: "paragraph", content: [{ type: "text", text }] }] });
const textOf = (c: { body: { content?: Array<{ content?: Array<{ text?: string }> }> } }) => c.body.content?.[0]?.content?.[0]?.text ?? "";

interface Comment {
  id: string;
  body: { content?: Array<{ content?: Array<{ text?: string }> }> };
}
interface Thread {
  id: string;
  comments: Comment[];
}

async function json<T = any>(res: APIResponse, status: number): Promise<T> {
  expect(res.status(), `${res.url()}: ${(await res.text()).slice(0, 300)}`).toBe(status);
  return (await res.json()) as T;
}

test("50 clients posting 20 comments each into one thread: all 1,000 stored once, retries idempotent, no 5xx", async ({ newContext, playwright }) => {
  // A hang guard, not a performance check: generous enough for 1,000 posts on a busy two-core machine.
  test.setTimeout(300_000);
  const baseURL = test.info().project.use.baseURL!;
  const origin = new URL(baseURL).origin;
  const headers = { origin };

  // The author sets up a figure with one panel whose revision is bound to a demo Hahn-echo version.
  const authorContext = await newContext();
  const author = await authorContext.newPage();
  await signIn(author, "author@lab.example.org");
  const { items } = await json<{ items: Array<{ kind: string; tags: Record<string, string>; latestVersion: { id: string } | null }> }>(
    await author.request.get(`/api/manuscripts/${DEMO_MANUSCRIPT}/datasets`),
    200,
  );
  const echo = items.find((d) => d.kind === "hahn_echo" && !d.tags.derivedFrom && d.latestVersion)!;
  expect(echo).toBeTruthy();
  const figure = await json(
    await author.request.post("/api/figures", { headers, data: { manuscriptId: DEMO_MANUSCRIPT, title: "Concurrency: 50 reviewers at once" } }),
    201,
  );
  const panel = await json(await author.request.post(`/api/figures/${figure.id}/panels`, { headers, data: { title: "echo" } }), 201);
  const revision = await json(
    await author.request.post(`/api/panels/${panel.id}/revisions`, {
      headers,
      data: { spec: SPEC, bindings: { echo: { versionId: echo.latestVersion!.id } }, baseRevisionId: null, message: "for the concurrency test" },
    }),
    201,
  );
  await authorContext.close();

  // The reviewer signs in once and opens the thread; the 50 clients carry that session.
  const reviewerContext = await newContext();
  const reviewer = await reviewerContext.newPage();
  await signIn(reviewer, "reviewer@partner.example.org");
  const thread = await json<Thread>(
    await reviewer.request.post(`/api/panels/${panel.id}/threads`, {
      headers,
      data: { body: doc("Thread for the concurrency test"), revisionId: revision.id, clientKey: "concurrency-thread" },
    }),
    201,
  );
  const storageState = await reviewerContext.storageState();
  await reviewerContext.close();

  const clients: APIRequestContext[] = await Promise.all(
    Array.from({ length: CLIENTS }, () => playwright.request.newContext({ baseURL, storageState, extraHTTPHeaders: headers })),
  );
  const statuses: number[] = [];
  const retried: Array<{ key: string; status: number }> = [];
  const post = async (key: string) => {
    const res = await clients[Number(key.slice(1, key.indexOf("-")))]!.post(`/api/threads/${thread.id}/comments`, {
      // No per-request budget (0 = none): a slow answer is not a failure; the test timeout guards hangs.
      headers,
      data: { body: doc(`comment ${key}`), clientKey: `concurrency-${key}` },
      timeout: 0,
    });
    statuses.push(res.status());
    await res.dispose();
    return res.status();
  };
  try {
    await Promise.all(
      Array.from({ length: CLIENTS }, async (_, c) => {
        for (let i = 0; i < PER_CLIENT; i++) {
          const key = `c${c}-${i}`;
          if ((await post(key)) === 201 && RETRIED.has(key)) retried.push({ key, status: await post(key) });
        }
      }),
    );
  } finally {
    await Promise.all(clients.map((c) => c.dispose()));
  }

  const byStatus = statuses.reduce<Record<number, number>>((a, s) => ({ ...a, [s]: (a[s] ?? 0) + 1 }), {});
  expect(
    statuses.filter((s) => s >= 500),
    `statuses: ${JSON.stringify(byStatus)}`,
  ).toEqual([]);
  expect(byStatus, "every post and every retry answered 201").toEqual({ 201: CLIENTS * PER_CLIENT + RETRIED.size });
  expect(retried.sort((a, b) => a.key.localeCompare(b.key))).toEqual([...RETRIED].sort().map((key) => ({ key, status: 201 })));

  const list = await playwright.request.newContext({ baseURL, storageState, extraHTTPHeaders: headers });
  const { items: threads } = await json<{ items: Thread[] }>(await list.get(`/api/panels/${panel.id}/threads`), 200);
  await list.dispose();
  const stored = threads.find((t) => t.id === thread.id)!.comments;
  const texts = stored.map(textOf).filter((t) => t.startsWith("comment c"));
  const expected = Array.from({ length: CLIENTS * PER_CLIENT }, (_, k) => `comment c${Math.floor(k / PER_CLIENT)}-${k % PER_CLIENT}`);
  expect(texts).toHaveLength(CLIENTS * PER_CLIENT);
  expect(new Set(texts).size, "no comment stored twice").toBe(CLIENTS * PER_CLIENT);
  expect(new Set(stored.map((c) => c.id)).size).toBe(stored.length);
  expect([...texts].sort()).toEqual([...expected].sort());
  for (const key of RETRIED)
    expect(
      texts.filter((t) => t === `comment ${key}`),
      `retried ${key} stored once`,
    ).toHaveLength(1);
  expect(stored).toHaveLength(CLIENTS * PER_CLIENT + 1); // and the opening comment
});
