import { sql } from "drizzle-orm";
import { text, integer } from "drizzle-orm/sqlite-core";

export const id = () => text("id").primaryKey();
export const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(unixepoch('subsec') * 1000)`);

/** When the thing was archived: it leaves lists and pickers but stays resolvable from every trace. Null = in use. */
export const archivedAt = () => integer("archived_at", { mode: "timestamp_ms" });
