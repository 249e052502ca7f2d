import { index, integer, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import { archivedAt, createdAt, id } from "./columns";
import { manuscripts, users } from "./people";

export const MEASUREMENT_KINDS = ["pl_map", "pl_spectrum", "odmr", "hahn_echo", "decoupling", "relaxation", "ramsey", "nv_nmr", "other"] as const;
export type MeasurementKind = (typeof MEASUREMENT_KINDS)[number];

export const datasets = sqliteTable(
  "datasets",
  {
    id: id(),
    manuscriptId: text("manuscript_id")
      .notNull()
      .references(() => manuscripts.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    kind: text("kind", { enum: MEASUREMENT_KINDS }).notNull().default("other"),
    sample: text("sample"),
    instrument: text("instrument"),
    measuredAt: text("measured_at"),
    notes: text("notes"),
    tags: text("tags", { mode: "json" }).$type<Record<string, string>>().notNull().default({}),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    archivedAt: archivedAt(),
  },
  (t) => [index("datasets_manuscript").on(t.manuscriptId)],
);

/** `header`: the file's header cell the name and unit were split from (kept since issue 17; absent on older versions). */
export interface StoredColumn {
  name: string;
  unit: string | null;
  type: "number" | "string";
  header?: string;
}
export interface ParseInfo {
  format: string;
  encoding: string;
  delimiter: string | null;
  decimal: string;
  warnings: string[];
  headerMetadata: Record<string, string>;
}
export interface StoredSummary {
  column: string;
  unit: string | null;
  count: number;
  missing: number;
  min: number | null;
  max: number | null;
  mean: number | null;
  sd: number | null;
}

export const versions = sqliteTable(
  "versions",
  {
    id: id(),
    datasetId: text("dataset_id")
      .notNull()
      .references(() => datasets.id, { onDelete: "cascade" }),
    number: integer("number").notNull(),
    sha256: text("sha256").notNull(),
    byteSize: integer("byte_size").notNull(),
    fileName: text("file_name").notNull(),
    rowCount: integer("row_count").notNull(),
    columns: text("columns", { mode: "json" }).$type<StoredColumn[]>().notNull(),
    parseInfo: text("parse_info", { mode: "json" }).$type<ParseInfo>().notNull(),
    summary: text("summary", { mode: "json" }).$type<StoredSummary[]>().notNull().default([]),
    derivedFromAnalysisId: text("derived_from_analysis_id"),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("versions_dataset_number").on(t.datasetId, t.number), index("versions_sha").on(t.sha256)],
);

export const analyses = sqliteTable(
  "analyses",
  {
    id: id(),
    manuscriptId: text("manuscript_id")
      .notNull()
      .references(() => manuscripts.id, { onDelete: "cascade" }),
    versionId: text("version_id")
      .notNull()
      .references(() => versions.id),
    inputSha256: text("input_sha256").notNull(),
    model: text("model").notNull(),
    modelVersion: text("model_version").notNull(),
    options: text("options", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    result: text("result", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    derivedVersionId: text("derived_version_id"),
    createdBy: text("created_by")
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    archivedAt: archivedAt(),
  },
  (t) => [index("analyses_version").on(t.versionId)],
);
