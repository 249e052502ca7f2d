import "server-only";
import { AsyncLocalStorage } from "node:async_hooks";
import { notFound } from "@/lib/errors";

const store = new AsyncLocalStorage<Map<string, Promise<unknown>>>();

/** Runs one request with its own memo (the route wrapper does this for every API request). */
export function withRequestMemo<T>(run: () => Promise<T>): Promise<T> {
  return store.run(new Map(), run);
}

/**
 * Within one request, a lookup of something that never changes once written (which manuscript a
 * panel or thread belongs to) runs once however many layers ask; outside a request it just runs.
 * Not for anything a request may change, such as states; the caller's roles are kept, and every
 * write of memberships forgets them (`forgetInRequest`).
 */
export function onceInRequest<T>(key: string, load: () => Promise<T>): Promise<T> {
  const memo = store.getStore();
  if (!memo) return load();
  let hit = memo.get(key) as Promise<T> | undefined;
  if (!hit) {
    hit = load();
    memo.set(key, hit);
  }
  return hit;
}

/** After a write that changes what lookups starting with `prefix` answer: they run again. */
export function forgetInRequest(prefix: string): void {
  const memo = store.getStore();
  if (memo) for (const key of memo.keys()) if (key.startsWith(prefix)) memo.delete(key);
}

/** Runs `fn` outside any request's memo: work a request starts for later (a timer) is not part of it. */
export function outsideRequest<T>(fn: () => T): T {
  return store.exit(fn);
}

/**
 * Which manuscript a thing belongs to (`find` answers its row, `m` the manuscript id), asked once
 * per request: what a panel, figure, revision, dataset or version belongs to never changes. 404
 * when there is no such thing, before any permission is checked.
 */
export function manuscriptOnceInRequest(what: string, id: string, find: () => Promise<Array<{ m: string }>>): Promise<string> {
  return onceInRequest(`${what}:${id}`, async () => {
    const [row] = await find();
    if (!row) throw notFound();
    return row.m;
  });
}
