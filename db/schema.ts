import { sql } from "drizzle-orm";
import { index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";

const id = () => text("id").primaryKey();
const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" }).notNull().default(sql`(unixepoch('subsec') * 1000)`);

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
    labId: text("lab_id").notNull().references(() => labs.id, { onDelete: "cascade" }),
    userId: text("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: LAB_ROLES }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.labId, t.userId] }), index("lab_members_user").on(t.userId)],
);

export const manuscripts = sqliteTable("manuscripts", {
  id: id(),
  labId: text("lab_id").notNull().references(() => labs.id),
  title: text("title").notNull(),
  createdBy: text("created_by").notNull().references(() => users.id),
  createdAt: createdAt(),
});

export const manuscriptMembers = sqliteTable(
  "manuscript_members",
  {
    manuscriptId: text("manuscript_id").notNull().references(() => manuscripts.id, { onDelete: "cascade" }),
    userId: text("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: ROLES }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.manuscriptId, t.userId] }), index("manuscript_members_user").on(t.userId)],
);

export const invitations = sqliteTable("invitations", {
  id: id(),
  manuscriptId: text("manuscript_id").notNull().references(() => manuscripts.id, { onDelete: "cascade" }),
  email: text("email").notNull(),
  role: text("role", { enum: ROLES }).notNull(),
  tokenHash: text("token_hash").notNull().unique(),
  invitedBy: text("invited_by").notNull().references(() => users.id),
  createdAt: createdAt(),
  expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
  acceptedAt: integer("accepted_at", { mode: "timestamp_ms" }),
  acceptedBy: text("accepted_by").references(() => users.id),
});

export const apiTokens = sqliteTable("api_tokens", {
  id: id(),
  userId: text("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
  name: text("name").notNull(),
  tokenHash: text("token_hash").notNull().unique(),
  prefix: text("prefix").notNull(),
  createdAt: createdAt(),
  lastUsedAt: integer("last_used_at", { mode: "timestamp_ms" }),
  revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
});

export const signInLinks = sqliteTable("sign_in_links", {
  id: id(),
  userId: text("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
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
    html: text("html_body"),
    status: text("status", { enum: ["pending", "sending", "sent", "failed"] }).notNull().default("pending"),
    attempts: integer("attempts").notNull().default(0),
    nextAttemptAt: integer("next_attempt_at", { mode: "timestamp_ms" }).notNull(),
    leaseUntil: integer("lease_until", { mode: "timestamp_ms" }),
    lastError: text("last_error"),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("mail_outbox_due").on(t.status, t.nextAttemptAt)],
);

export const MEASUREMENT_KINDS = [
  "pl_map", "pl_spectrum", "odmr", "hahn_echo", "relaxation", "ramsey", "nv_nmr", "other",
] as const;
export type MeasurementKind = (typeof MEASUREMENT_KINDS)[number];

export const datasets = sqliteTable(
  "datasets",
  {
    id: id(),
    manuscriptId: text("manuscript_id").notNull().references(() => manuscripts.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    kind: text("kind", { enum: MEASUREMENT_KINDS }).notNull().default("other"),
    sample: text("sample"),
    instrument: text("instrument"),
    measuredAt: text("measured_at"),
    notes: text("notes"),
    tags: text("tags", { mode: "json" }).$type<Record<string, string>>().notNull().default({}),
    createdBy: text("created_by").notNull().references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("datasets_manuscript").on(t.manuscriptId)],
);

export interface StoredColumn { name: string; unit: string | null; type: "number" | "string" }
export interface ParseInfo {
  format: string; encoding: string; delimiter: string | null; decimal: string; warnings: string[];
  headerMetadata: Record<string, string>;
}
export interface StoredSummary { column: string; unit: string | null; count: number; missing: number; min: number | null; max: number | null; mean: number | null; sd: number | null }

export const versions = sqliteTable(
  "versions",
  {
    id: id(),
    datasetId: text("dataset_id").notNull().references(() => datasets.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    sha256: text("sha256").notNull(),
    byteSize: integer("byte_size").notNull(),
    fileName: text("file_name").notNull(),
    rowCount: integer("row_count").notNull(),
    columns: text("columns", { mode: "json" }).$type<StoredColumn[]>().notNull(),
    parseInfo: text("parse_info", { mode: "json" }).$type<ParseInfo>().notNull(),
    summary: text("summary", { mode: "json" }).$type<StoredSummary[]>().notNull().default([]),
    derivedFromAnalysisId: text("derived_from_analysis_id"),
    createdBy: text("created_by").notNull().references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("versions_dataset_number").on(t.datasetId, t.number), index("versions_sha").on(t.sha256)],
);

export const analyses = sqliteTable(
  "analyses",
  {
    id: id(),
    manuscriptId: text("manuscript_id").notNull().references(() => manuscripts.id, { onDelete: "cascade" }),
    versionId: text("version_id").notNull().references(() => versions.id),
    inputSha256: text("input_sha256").notNull(),
    model: text("model").notNull(),
    modelVersion: text("model_version").notNull(),
    options: text("options", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    result: text("result", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    derivedVersionId: text("derived_version_id"),
    createdBy: text("created_by").notNull().references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("analyses_version").on(t.versionId)],
);

export const figures = sqliteTable(
  "figures",
  {
    id: id(),
    manuscriptId: text("manuscript_id").notNull().references(() => manuscripts.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    title: text("title").notNull(),
    widthMm: real("width_mm").notNull().default(183),
    maxHeightMm: real("max_height_mm").notNull().default(170),
    columns: integer("columns").notNull().default(2),
    requiredReviewers: text("required_reviewers", { mode: "json" }).$type<string[]>().notNull().default([]),
    createdBy: text("created_by").notNull().references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("figures_manuscript_number").on(t.manuscriptId, t.number)],
);

export const panels = sqliteTable(
  "panels",
  {
    id: id(),
    figureId: text("figure_id").notNull().references(() => figures.id, { onDelete: "cascade" }),
    position: integer("position").notNull(),
    title: text("title").notNull().default(""),
    colSpan: integer("col_span").notNull().default(1),
    currentRevisionId: text("current_revision_id"),
    createdBy: text("created_by").notNull().references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("panels_figure").on(t.figureId, t.position)],
);

export interface BoundInput { kind: "version" | "analysis"; id: string; versionId: string; sha256: string; output?: string }
export type Binding = { versionId: string } | { analysisId: string; output: "curve" | "residuals" | "data" };

export const revisions = sqliteTable(
  "revisions",
  {
    id: id(),
    panelId: text("panel_id").notNull().references(() => panels.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    spec: text("spec").notNull(),
    bindings: text("bindings", { mode: "json" }).$type<Record<string, Binding>>().notNull(),
    bound: text("bound", { mode: "json" }).$type<Record<string, BoundInput>>().notNull(),
    message: text("message").notNull().default(""),
    contentHash: text("content_hash").notNull(),
    createdBy: text("created_by").notNull().references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("revisions_panel_number").on(t.panelId, t.number), index("revisions_hash").on(t.contentHash)],
);

export type Anchor = { type: "point"; x: number; y: number } | { type: "xrange"; x0: number; x1: number };

export const threads = sqliteTable(
  "threads",
  {
    id: id(),
    panelId: text("panel_id").notNull().references(() => panels.id, { onDelete: "cascade" }),
    revisionId: text("revision_id").notNull().references(() => revisions.id),
    anchor: text("anchor", { mode: "json" }).$type<Anchor | null>(),
    resolvedAt: integer("resolved_at", { mode: "timestamp_ms" }),
    resolvedBy: text("resolved_by").references(() => users.id),
    createdBy: text("created_by").notNull().references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("threads_panel").on(t.panelId)],
);

export const comments = sqliteTable(
  "comments",
  {
    id: id(),
    threadId: text("thread_id").notNull().references(() => threads.id, { onDelete: "cascade" }),
    body: text("body", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    html: text("html").notNull(),
    mentions: text("mentions", { mode: "json" }).$type<string[]>().notNull().default([]),
    clientKey: text("client_key"),
    createdBy: text("created_by").notNull().references(() => users.id),
    createdAt: createdAt(),
    editedAt: integer("edited_at", { mode: "timestamp_ms" }),
    deletedAt: integer("deleted_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("comments_thread").on(t.threadId), uniqueIndex("comments_client_key").on(t.createdBy, t.clientKey)],
);

export const commentEdits = sqliteTable("comment_edits", {
  id: id(),
  commentId: text("comment_id").notNull().references(() => comments.id, { onDelete: "cascade" }),
  body: text("body", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
  html: text("html").notNull(),
  replacedAt: integer("replaced_at", { mode: "timestamp_ms" }).notNull(),
});

export const DECISIONS = ["approved", "needs_revision"] as const;

export const decisions = sqliteTable(
  "decisions",
  {
    id: id(),
    panelId: text("panel_id").notNull().references(() => panels.id, { onDelete: "cascade" }),
    revisionId: text("revision_id").notNull().references(() => revisions.id),
    contentHash: text("content_hash").notNull(),
    decision: text("decision", { enum: DECISIONS }).notNull(),
    note: text("note").notNull().default(""),
    userId: text("user_id").notNull().references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("decisions_panel").on(t.panelId)],
);

export const signoffs = sqliteTable(
  "signoffs",
  {
    id: id(),
    figureId: text("figure_id").notNull().references(() => figures.id, { onDelete: "cascade" }),
    figureHash: text("figure_hash").notNull(),
    reason: text("reason").notNull().default(""),
    userId: text("user_id").notNull().references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("signoffs_figure").on(t.figureId)],
);
