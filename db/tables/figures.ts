import { index, integer, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { archivedAt, createdAt, id } from "./columns";
import { manuscripts, users } from "./people";

export const figures = sqliteTable(
  "figures",
  {
    id: id(),
    manuscriptId: text("manuscript_id")
      .notNull()
      .references(() => manuscripts.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    title: text("title").notNull(),
    widthMm: real("width_mm").notNull().default(183),
    maxHeightMm: real("max_height_mm").notNull().default(170),
    columns: integer("columns").notNull().default(2),
    /** One y-axis title per row: later panels of a row whose y title repeats the first's leave it out when drawn. */
    shareYTitles: integer("share_y_titles", { mode: "boolean" }).notNull().default(false),
    requiredReviewers: text("required_reviewers", { mode: "json" }).$type<string[]>().notNull().default([]),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    archivedAt: archivedAt(),
  },
  (t) => [uniqueIndex("figures_manuscript_number").on(t.manuscriptId, t.number)],
);

export const panels = sqliteTable(
  "panels",
  {
    id: id(),
    figureId: text("figure_id")
      .notNull()
      .references(() => figures.id, { onDelete: "cascade" }),
    position: integer("position").notNull(),
    title: text("title").notNull().default(""),
    colSpan: integer("col_span").notNull().default(1),
    currentRevisionId: text("current_revision_id"),
    /** When the author sent the panel to review; null while it is a draft (reviewers are not asked yet). */
    reviewRequestedAt: integer("review_requested_at", { mode: "timestamp_ms" }),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    archivedAt: archivedAt(),
  },
  (t) => [index("panels_figure").on(t.figureId, t.position)],
);

export interface BoundInput {
  kind: "version" | "analysis";
  id: string;
  versionId: string;
  sha256: string;
  output?: string;
  /** For output "parameters": SHA-256 of the run's parameter rows, so the content hash follows the fitted values. */
  resultSha256?: string;
}
export type Binding = { versionId: string } | { analysisId: string; output: "curve" | "residuals" | "data" | "parameters" };

export const revisions = sqliteTable(
  "revisions",
  {
    id: id(),
    panelId: text("panel_id")
      .notNull()
      .references(() => panels.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    spec: text("spec").notNull(),
    bindings: text("bindings", { mode: "json" }).$type<Record<string, Binding>>().notNull(),
    bound: text("bound", { mode: "json" }).$type<Record<string, BoundInput>>().notNull(),
    message: text("message").notNull().default(""),
    contentHash: text("content_hash").notNull(),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("revisions_panel_number").on(t.panelId, t.number), index("revisions_hash").on(t.contentHash)],
);
