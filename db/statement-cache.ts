import Database from "libsql";

/** Per connection; drizzle writes `in (?, ?, …)` with one placeholder per value, so shapes vary. */
const STATEMENTS_PER_CONNECTION = 256;

type Prepare = (this: object, sql: string) => unknown;
type Close = (this: object) => unknown;
let installed = false;

/**
 * The libSQL client for `file:` databases prepares (parses and plans) every statement anew on each
 * call, about a tenth of the CPU of a board read or a comment post. This keeps each connection's
 * last prepared statements by SQL text and hands them out again. That is safe because the client
 * runs a statement to completion (`all` or `run`) before it returns, so one statement is never in
 * use twice at once, and SQLite resets a statement before it runs again, also after an error.
 * Closing a connection drops its statements.
 */
export function cacheStatements(): void {
  if (installed) return;
  installed = true;
  const proto = Database.prototype as unknown as { prepare: Prepare; close: Close };
  const prepare = proto.prepare;
  const close = proto.close;
  const caches = new WeakMap<object, Map<string, unknown>>();
  proto.prepare = function (sql) {
    let cache = caches.get(this);
    if (!cache) caches.set(this, (cache = new Map<string, unknown>()));
    const hit = cache.get(sql);
    if (hit !== undefined) {
      cache.delete(sql); // most recently used goes last
      cache.set(sql, hit);
      return hit;
    }
    const stmt = prepare.call(this, sql);
    if (cache.size >= STATEMENTS_PER_CONNECTION) cache.delete(cache.keys().next().value!);
    cache.set(sql, stmt);
    return stmt;
  };
  proto.close = function () {
    caches.delete(this);
    return close.call(this);
  };
}
