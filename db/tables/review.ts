import { sql } from "drizzle-orm";
import { index, integer, primaryKey, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { createdAt, id } from "./columns";
import { panels, revisions, figures } from "./figures";
import { users } from "./people";

export type Anchor = { type: "point"; x: number; y: number } | { type: "xrange"; x0: number; x1: number };

export const threads = sqliteTable(
  "threads",
  {
    id: id(),
    panelId: text("panel_id")
      .notNull()
      .references(() => panels.id, { onDelete: "cascade" }),
    revisionId: text("revision_id")
      .notNull()
      .references(() => revisions.id),
    anchor: text("anchor", { mode: "json" }).$type<Anchor | null>(),
    resolvedAt: integer("resolved_at", { mode: "timestamp_ms" }),
    resolvedBy: text("resolved_by").references(() => users.id),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("threads_panel").on(t.panelId)],
);

/**
 * A person's explicit choice about a thread's reply notices: `following` true to hear of every reply
 * (without having written), false to stop hearing of it (though they wrote in it). No row: writers hear.
 */
export const threadFollows = sqliteTable(
  "thread_follows",
  {
    threadId: text("thread_id")
      .notNull()
      .references(() => threads.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    following: integer("following", { mode: "boolean" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.threadId, t.userId] })],
);

export const comments = sqliteTable(
  "comments",
  {
    id: id(),
    threadId: text("thread_id")
      .notNull()
      .references(() => threads.id, { onDelete: "cascade" }),
    body: text("body", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    html: text("html").notNull(),
    mentions: text("mentions", { mode: "json" }).$type<string[]>().notNull().default([]),
    clientKey: text("client_key"),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    editedAt: integer("edited_at", { mode: "timestamp_ms" }),
    deletedAt: integer("deleted_at", { mode: "timestamp_ms" }),
  },
  (t) => [
    index("comments_thread").on(t.threadId),
    uniqueIndex("comments_client_key").on(t.createdBy, t.clientKey),
    // The review queue's mentions: only comments that mention someone, and each person's last word in a thread.
    index("comments_mentioning")
      .on(t.threadId, t.createdAt)
      .where(sql`${t.mentions} <> '[]'`),
    index("comments_thread_author").on(t.threadId, t.createdBy, t.createdAt),
  ],
);

export const commentEdits = sqliteTable("comment_edits", {
  id: id(),
  commentId: text("comment_id")
    .notNull()
    .references(() => comments.id, { onDelete: "cascade" }),
  body: text("body", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
  html: text("html").notNull(),
  replacedAt: integer("replaced_at", { mode: "timestamp_ms" }).notNull(),
});

export const DECISIONS = ["approved", "needs_revision"] as const;

export const decisions = sqliteTable(
  "decisions",
  {
    id: id(),
    panelId: text("panel_id")
      .notNull()
      .references(() => panels.id, { onDelete: "cascade" }),
    revisionId: text("revision_id")
      .notNull()
      .references(() => revisions.id),
    contentHash: text("content_hash").notNull(),
    decision: text("decision", { enum: DECISIONS }).notNull(),
    note: text("note").notNull().default(""),
    userId: text("user_id")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("decisions_panel").on(t.panelId), index("decisions_latest").on(t.panelId, t.userId, t.contentHash, t.createdAt)],
);

export const signoffs = sqliteTable(
  "signoffs",
  {
    id: id(),
    figureId: text("figure_id")
      .notNull()
      .references(() => figures.id, { onDelete: "cascade" }),
    figureHash: text("figure_hash").notNull(),
    reason: text("reason").notNull().default(""),
    userId: text("user_id")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    /** A withdrawn sign-off stays on record; the figure is no longer signed off by it. */
    withdrawnAt: integer("withdrawn_at", { mode: "timestamp_ms" }),
    withdrawnBy: text("withdrawn_by").references(() => users.id),
    withdrawReason: text("withdraw_reason"),
  },
  (t) => [index("signoffs_figure").on(t.figureId)],
);
