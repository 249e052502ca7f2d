import { index, integer, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
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
    /** The figure the notice is about, when it is about one (for people who unfollowed that figure). */
    figureId: text("figure_id"),
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

export const DIGEST_FREQUENCIES = ["off", "daily", "weekly"] as const;
export type DigestFrequency = (typeof DIGEST_FREQUENCIES)[number];

/**
 * Which mail a person gets; no row means everything, following every manuscript they belong to,
 * and a digest on weekdays at 08:00 (UTC until they choose a time zone).
 */
export const mailPreferences = sqliteTable("mail_preferences", {
  userId: text("user_id")
    .primaryKey()
    .references(() => users.id, { onDelete: "cascade" }),
  /** Notice kinds turned off. */
  mutedKinds: text("muted_kinds", { mode: "json" }).$type<string[]>().notNull().default([]),
  /** Manuscripts whose notices are not wanted. */
  unfollowed: text("unfollowed", { mode: "json" }).$type<string[]>().notNull().default([]),
  /** Figures whose notices are not wanted (in manuscripts still followed). */
  unfollowedFigures: text("unfollowed_figures", { mode: "json" }).$type<string[]>().notNull().default([]),
  /** "daily": Monday to Friday; "weekly": Mondays; at `digestHour` o'clock in `timeZone`. */
  digest: text("digest", { enum: DIGEST_FREQUENCIES }).notNull().default("daily"),
  digestHour: integer("digest_hour").notNull().default(8),
  /** IANA name, e.g. "Europe/Berlin"; null until the person saves the settings page (then UTC). */
  timeZone: text("time_zone"),
  updatedAt: integer("updated_at", { mode: "timestamp_ms" }).notNull(),
});

/**
 * One row per person and digest period, whether or not a mail went out (an empty digest sends
 * nothing). The unique (user, period start) key is taken in the transaction that enqueues the
 * digest, so a crash, a rerun or a second instance can never send a period's digest twice.
 */
export const digestRuns = sqliteTable(
  "digest_runs",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** The scheduled moment this digest is for; its activity window ends here. */
    periodStart: integer("period_start", { mode: "timestamp_ms" }).notNull(),
    /** Where its activity window began (the previous digest's period start). */
    since: integer("since", { mode: "timestamp_ms" }).notNull(),
    /** Lines in the digest; 0 means nothing happened and no mail went out. */
    items: integer("items").notNull(),
    mailId: text("mail_id").references(() => mailOutbox.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("digest_runs_user_period").on(t.userId, t.periodStart)],
);

/**
 * An address the receiving server refused for good (an SMTP 5xx answer). Shown to the PI on the
 * members page; a later successful delivery to it removes the mark.
 */
export const mailBounces = sqliteTable("mail_bounces", {
  email: text("email").primaryKey(),
  /** The SMTP server's answer, e.g. "550 5.1.1 <x@y>: Recipient address rejected". */
  answer: text("answer").notNull(),
  at: integer("at", { mode: "timestamp_ms" }).notNull(),
});
