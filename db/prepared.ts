import "server-only";
import { getDb, type Database } from "./client";

/**
 * A query built once per database handle, with `sql.placeholder` for its arguments, for lookups
 * every request makes (the caller's token, their role, the manuscript row): building a query
 * through the builder costs about as much CPU as SQLite running it.
 */
export function preparedQuery<Q>(build: (db: Database) => Q): () => Q {
  const byDb = new WeakMap<Database, Q>();
  return () => {
    const db = getDb();
    let q = byDb.get(db);
    if (!q) byDb.set(db, (q = build(db)));
    return q;
  };
}
