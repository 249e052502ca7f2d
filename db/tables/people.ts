import { index, integer, primaryKey, sqliteTable, text } from "drizzle-orm/sqlite-core";
import { createdAt, id } from "./columns";

export const ROLES = ["pi", "author", "reviewer", "viewer"] as const;
export type Role = (typeof ROLES)[number];
export const LAB_ROLES = ["head", "member"] as const;
export type LabRole = (typeof LAB_ROLES)[number];

export const users = sqliteTable("users", {
  id: id(),
  email: text("email").notNull().unique(),
  name: text("name").notNull(),
  passwordHash: text("password_hash"),
  createdAt: createdAt(),
});

export const labs = sqliteTable("labs", {
  id: id(),
  name: text("name").notNull(),
  createdAt: createdAt(),
});

export const labMembers = sqliteTable(
  "lab_members",
  {
    labId: text("lab_id")
      .notNull()
      .references(() => labs.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: LAB_ROLES }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.labId, t.userId] }), index("lab_members_user").on(t.userId)],
);

export const manuscripts = sqliteTable("manuscripts", {
  id: id(),
  labId: text("lab_id")
    .notNull()
    .references(() => labs.id),
  title: text("title").notNull(),
  /** The manuscript's house style for exports (fonts, sizes, line widths, panel letters); null = the defaults. */
  houseStyle: text("house_style", { mode: "json" }).$type<Record<string, unknown>>(),
  createdBy: text("created_by")
    .notNull()
    .references(() => users.id),
  createdAt: createdAt(),
  /**
   * Raised by triggers (migration 0012) whenever anything the manuscript's overview reads changes:
   * figures, panels, revisions, decisions, sign-offs, threads, members and their names, datasets.
   * Every instance compares it with what it has cached, so a write anywhere is seen everywhere.
   */
  reviewStamp: integer("review_stamp").notNull().default(0),
});

export const manuscriptMembers = sqliteTable(
  "manuscript_members",
  {
    manuscriptId: text("manuscript_id")
      .notNull()
      .references(() => manuscripts.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: ROLES }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.manuscriptId, t.userId] }), index("manuscript_members_user").on(t.userId)],
);

export const invitations = sqliteTable("invitations", {
  id: id(),
  manuscriptId: text("manuscript_id")
    .notNull()
    .references(() => manuscripts.id, { onDelete: "cascade" }),
  email: text("email").notNull(),
  role: text("role", { enum: ROLES }).notNull(),
  tokenHash: text("token_hash").notNull().unique(),
  invitedBy: text("invited_by")
    .notNull()
    .references(() => users.id),
  createdAt: createdAt(),
  expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
  acceptedAt: integer("accepted_at", { mode: "timestamp_ms" }),
  acceptedBy: text("accepted_by").references(() => users.id),
});

export const apiTokens = sqliteTable("api_tokens", {
  id: id(),
  userId: text("user_id")
    .notNull()
    .references(() => users.id, { onDelete: "cascade" }),
  name: text("name").notNull(),
  tokenHash: text("token_hash").notNull().unique(),
  prefix: text("prefix").notNull(),
  createdAt: createdAt(),
  lastUsedAt: integer("last_used_at", { mode: "timestamp_ms" }),
  revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
});

export const signInLinks = sqliteTable("sign_in_links", {
  id: id(),
  userId: text("user_id")
    .notNull()
    .references(() => users.id, { onDelete: "cascade" }),
  tokenHash: text("token_hash").notNull().unique(),
  createdAt: createdAt(),
  expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
  usedAt: integer("used_at", { mode: "timestamp_ms" }),
});

export const signInFailures = sqliteTable(
  "sign_in_failures",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    email: text("email").notNull(),
    ip: text("ip").notNull(),
    at: integer("at", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [index("sign_in_failures_email").on(t.email, t.at), index("sign_in_failures_ip").on(t.ip, t.at)],
);

/** One row per browser sign-in; the session cookie names it, and sign-out revokes it. */
export const sessions = sqliteTable(
  "sessions",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    createdAt: createdAt(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("sessions_user").on(t.userId)],
);

/** Events counted by rate limits (sign-in links, invitations, comments, uploads), keyed by bucket. */
export const rateEvents = sqliteTable(
  "rate_events",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    bucket: text("bucket").notNull(),
    at: integer("at", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [index("rate_events_bucket").on(t.bucket, t.at)],
);

export const auditLog = sqliteTable(
  "audit_log",
  {
    seq: integer("seq").primaryKey({ autoIncrement: true }),
    at: integer("at", { mode: "timestamp_ms" }).notNull(),
    actorId: text("actor_id"),
    manuscriptId: text("manuscript_id"),
    action: text("action").notNull(),
    target: text("target").notNull(),
    data: text("data").notNull(),
    prevHash: text("prev_hash").notNull(),
    hash: text("hash").notNull(),
  },
  (t) => [index("audit_manuscript").on(t.manuscriptId, t.seq)],
);

export const mailOutbox = sqliteTable(
  "mail_outbox",
  {
    id: id(),
    kind: text("kind").notNull(),
    to: text("to_address").notNull(),
    subject: text("subject").notNull(),
    text: text("text_body").notNull(),
    /** Drawn from `view` by the outbox worker before the first attempt (react-email). */
    html: text("html_body"),
    /** The data the HTML part is drawn from (lib/server/mail/render/mail-views.d.mts). */
    view: text("view", { mode: "json" }).$type<{ kind: string }>(),
    /** Extra headers for the message (List-Unsubscribe and List-Unsubscribe-Post on notices). */
    headers: text("headers", { mode: "json" }).$type<Record<string, string>>(),
    status: text("status", { enum: ["pending", "sending", "sent", "failed"] })
      .notNull()
      .default("pending"),
    attempts: integer("attempts").notNull().default(0),
    nextAttemptAt: integer("next_attempt_at", { mode: "timestamp_ms" }).notNull(),
    leaseUntil: integer("lease_until", { mode: "timestamp_ms" }),
    lastError: text("last_error"),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("mail_outbox_due").on(t.status, t.nextAttemptAt)],
);
