import fs from "node:fs";
import path from "node:path";
import { migrate } from "drizzle-orm/libsql/migrator";
import { getClient, getDb } from "./client";

const migrationsFolder = path.join(process.cwd(), "db", "migrations");

/** Applies pending migrations; WAL is a property of the file, so it is set once here. */
export async function applyMigrations(): Promise<void> {
  const client = getClient();
  if (client.protocol === "file") await client.execute("PRAGMA journal_mode=WAL");
  await migrate(getDb(), { migrationsFolder });
}

function expectedMigrationCount(): number {
  const journal = JSON.parse(fs.readFileSync(path.join(migrationsFolder, "meta", "_journal.json"), "utf8")) as { entries: unknown[] };
  return journal.entries.length;
}

export async function migrationsAreApplied(): Promise<boolean> {
  try {
    const rs = await getClient().execute("SELECT count(*) AS n FROM __drizzle_migrations");
    return Number(rs.rows[0]?.n ?? 0) >= expectedMigrationCount();
  } catch {
    return false;
  }
}
