import Database from "libsql";

/** Per connection; drizzle writes `in (?, ?, …)` with one placeholder per value, so shapes vary. */
const STATEMENTS_PER_CONNECTION = 256;

type Prepare = (this: object, sql: string) => unknown;
type Close = (this: object) => unknown;
let installed = false;
let pragmas: string[] = [];

/** Settings each connection of this process gets on its first statement (those opened before keep theirs). */
export function setConnectionPragmas(list: string[]): void {
  pragmas = list;
}

/**
 * The libSQL client for `file:` databases prepares (parses and plans) every statement anew on each
 * call, about a tenth of the CPU of a board read or a comment post. This keeps each connection's
 * last prepared statements by SQL text and hands them out again. That is safe because the client
 * runs a statement to completion (`all` or `run`) before it returns, so one statement is never in
 * use twice at once, and SQLite resets a statement before it runs again, also after an error.
 * Closing a connection drops its statements. A statement with a `*` column list is never kept: its
 * columns are fixed when it is prepared, so a column added since (by a migration on any
 * connection) would be missing from its answers.
 */
export function cacheStatements(): void {
  if (installed) return;
  installed = true;
  const proto = Database.prototype as unknown as { prepare: Prepare; close: Close };
  const prepare = proto.prepare;
  const close = proto.close;
  const caches = new WeakMap<object, Map<string, unknown>>();
  proto.prepare = function (sql) {
    if (listsEveryColumn(sql)) return prepare.call(this, sql);
    let cache = caches.get(this);
    if (!cache) {
      caches.set(this, (cache = new Map<string, unknown>()));
      for (const p of pragmas) (this as unknown as { exec(sql: string): void }).exec(p);
    }
    const hit = cache.get(sql);
    if (hit !== undefined) {
      cache.delete(sql); // most recently used goes last
      cache.set(sql, hit);
      return hit;
    }
    const stmt = keepSettings(prepare.call(this, sql) as Statement);
    if (cache.size >= STATEMENTS_PER_CONNECTION) cache.delete(cache.keys().next().value!);
    cache.set(sql, stmt);
    return stmt;
  };
  proto.close = function () {
    caches.delete(this);
    return close.call(this);
  };
}

interface Statement {
  raw: (this: Statement, on?: boolean) => Statement;
  safeIntegers: (this: Statement, on?: boolean) => Statement;
  columns: (this: Statement) => unknown[];
}

/**
 * The client sets raw and 64-bit integer mode and reads the result columns on every run, each a call
 * into the native module (columns twice, building new objects): a kept statement answers these from
 * what it last set or read (kept statements name their columns). `raw` on a statement that returns
 * no rows throws, and keeps throwing.
 */
function keepSettings(stmt: Statement): Statement {
  const { raw, safeIntegers, columns } = Object.getPrototypeOf(stmt) as Statement;
  let rawOn: boolean | undefined;
  let rawError: Error | undefined;
  let safeOn: boolean | undefined;
  let cols: unknown[] | undefined;
  stmt.raw = function (on = true) {
    if (rawError) throw rawError;
    if (rawOn !== on) {
      try {
        raw.call(this, on);
      } catch (err) {
        throw (rawError = err instanceof Error ? err : new Error(String(err)));
      }
      rawOn = on;
    }
    return this;
  };
  stmt.safeIntegers = function (on = true) {
    if (safeOn !== on) safeIntegers.call(this, (safeOn = on));
    return this;
  };
  stmt.columns = function () {
    return (cols ??= columns.call(this));
  };
  return stmt;
}

/**
 * Whether the SQL lists columns with a wildcard: a `*` (or `t.*`) right after SELECT, DISTINCT, ALL,
 * RETURNING or a comma. A product such as `unixepoch('subsec') * 1000` follows an operand, and
 * count(*) follows a parenthesis, so statements with those are kept. Quoted text is skipped.
 */
export function listsEveryColumn(sql: string): boolean {
  const code = sql.replace(/'(?:[^']|'')*'/g, "''");
  return /(?:\bselect|\bdistinct|\ball|\breturning|,)\s*(?:(?:"[^"]*"|\w+)\s*\.\s*)?\*/i.test(code);
}
