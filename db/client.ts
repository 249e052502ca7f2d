import "server-only";
import fs from "node:fs";
import path from "node:path";
import { createClient, type Client } from "@libsql/client";
import { drizzle, type LibSQLDatabase } from "drizzle-orm/libsql";
import { env } from "@/lib/env";
import * as schema from "./schema";
import { cacheStatements } from "./statement-cache";

export type Database = LibSQLDatabase<typeof schema>;
export type Transaction = Parameters<Parameters<Database["transaction"]>[0]>[0];
export type Executor = Database | Transaction;

interface Handle {
  url: string;
  client: Client;
  db: Database;
}
let handle: Handle | undefined;

function ensureParentDir(url: string) {
  if (!url.startsWith("file:")) return;
  const file = url.slice("file:".length);
  if (file && file !== ":memory:") fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
}

/** The process-wide database. libSQL turns foreign keys on per connection; `timeout` is the busy timeout of every pooled connection, so it survives transactions. */
export function getDb(): Database {
  const url = env().databaseUrl;
  if (handle && handle.url === url) return handle.db;
  handle?.client.close();
  ensureParentDir(url);
  if (url.startsWith("file:")) cacheStatements();
  const client = createClient({ url, authToken: env().databaseAuthToken, timeout: 10_000 });
  handle = { url, client, db: drizzle(client, { schema }) };
  return handle.db;
}

export function getClient(): Client {
  getDb();
  return handle!.client;
}

export function closeDb(): void {
  handle?.client.close();
  handle = undefined;
}
