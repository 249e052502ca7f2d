import { index, integer, sqliteTable, text } from "drizzle-orm/sqlite-core";
import { createdAt, id } from "./columns";
import { mailOutbox, users } from "./people";

/**
 * One review notice for one person, written in the transaction of the event that caused it. The
 * outbox worker turns a person's pending notices into one mail once the first is older than the
 * coalescing window, stamping `mailId` in the same transaction that enqueues that mail.
 */
export const notices = sqliteTable(
  "notices",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    kind: text("kind").notNull(),
    manuscriptId: text("manuscript_id"),
    /** The whole subject when this notice goes out alone ("Figure 2b needs revision — <manuscript>"). */
    subject: text("subject").notNull(),
    /** The same without the manuscript, for a list of several ("Figure 2b needs revision"). */
    headline: text("headline").notNull(),
    /** Plain-text lines saying who did what (comment excerpts are already plain text). */
    body: text("body").notNull(),
    href: text("href").notNull(),
    mailId: text("mail_id").references(() => mailOutbox.id),
    createdAt: createdAt(),
  },
  (t) => [index("notices_pending").on(t.mailId, t.userId, t.createdAt)],
);

/** Which mail a person gets; no row means everything, following every manuscript they belong to. */
export const mailPreferences = sqliteTable("mail_preferences", {
  userId: text("user_id")
    .primaryKey()
    .references(() => users.id, { onDelete: "cascade" }),
  /** Notice kinds turned off. */
  mutedKinds: text("muted_kinds", { mode: "json" }).$type<string[]>().notNull().default([]),
  /** Manuscripts whose notices are not wanted. */
  unfollowed: text("unfollowed", { mode: "json" }).$type<string[]>().notNull().default([]),
  updatedAt: integer("updated_at", { mode: "timestamp_ms" }).notNull(),
});
