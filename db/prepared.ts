import "server-only";
import { getDb, type Database, type Executor } from "./client";

interface Session {
  client?: unknown;
  tx?: unknown;
}
const sessionOf = (x: object) => (x as { session?: Session }).session;

/**
 * A query built once per database handle, with `sql.placeholder` for its arguments, for the
 * statements every request makes: building a query through the builder costs about as much CPU as
 * SQLite running it. Given a transaction of that database, the same built query runs inside it, on
 * the transaction's connection; given any other handle, it is built for that one.
 */
export function preparedQuery<Q extends object>(build: (db: Database) => Q): (executor?: Executor) => Q {
  const byDb = new WeakMap<Database, Q>();
  return (executor) => {
    const db = getDb();
    let q = byDb.get(db);
    if (!q) byDb.set(db, (q = build(db)));
    if (!executor || executor === db) return q;
    const session = sessionOf(executor);
    if (session?.tx && session.client === (q as { client?: unknown }).client) return boundTo(q, session.tx);
    return build(executor as Database);
  };
}

/** The prepared query, reading its SQL and mapping from the one built, but executing on `tx`. */
function boundTo<Q extends object>(q: Q, tx: unknown): Q {
  const bound = Object.create(q) as Q & { tx: unknown };
  bound.tx = tx;
  return bound;
}
