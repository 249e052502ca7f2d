import "server-only";
import { z } from "zod";
import { MEASUREMENT_KINDS } from "@/db/schema";
import { stripUnsafeCharacters } from "../storage/file-name";

export const metadataInput = z
  .object({
    kind: z.enum(MEASUREMENT_KINDS, { message: `kind must be one of ${MEASUREMENT_KINDS.join(", ")}.` }).optional(),
    sample: z.string().trim().max(200).nullable().optional(),
    instrument: z.string().trim().max(200).nullable().optional(),
    measuredAt: z
      .string()
      .trim()
      .max(40)
      .refine((s) => !s || !Number.isNaN(Date.parse(s)), "measuredAt must be a date such as 2026-03-14 or 2026-03-14T10:30:00Z.")
      .nullable()
      .optional(),
    notes: z.string().max(10_000).nullable().optional(),
    tags: z
      .record(z.string().trim().min(1).max(60), z.string().max(200))
      .refine((t) => Object.keys(t).length <= 50, "at most 50 tags")
      .optional(),
  })
  .strict();
export type MetadataInput = z.infer<typeof metadataInput>;

const METADATA_FIELDS = ["kind", "sample", "instrument", "measuredAt", "notes", "tags"] as const;

/** PATCH /api/datasets/{id}: like the upload's metadata, but it must change something (an empty update has nothing to SET). */
export const metadataPatchInput = metadataInput.refine(
  (p) => METADATA_FIELDS.some((k) => p[k] !== undefined),
  `name at least one of ${METADATA_FIELDS.join(", ")} to change.`,
);

export const uploadFields = z.object({
  // Bidi and other control or format characters are taken out, as from file names.
  name: z.string().transform(stripUnsafeCharacters).pipe(z.string().trim().min(1, "give the dataset a name.").max(200)).optional(),
  datasetId: z.string().min(1).max(128).optional(),
  metadata: z.string().max(64_000, "metadata: at most 64,000 characters of JSON.").optional(),
  delimiter: z.enum([",", ";", "\t", "whitespace", "tab"]).optional(),
  decimal: z.enum([".", ","]).optional(),
  format: z.enum(["auto", "csv", "tsv", "text", "json", "matrix"]).optional(),
});
export type UploadFields = z.infer<typeof uploadFields>;

export const rowsQuery = z.object({
  offset: z.coerce.number().int().min(0, "offset must be ≥ 0").default(0),
  limit: z.coerce.number().int().min(1).max(10_000, "limit must be at most 10,000").default(100),
});

export const plotQuery = z.object({
  x: z.string({ message: "name the x column" }).min(1, "name the x column").max(1000, "a column name has at most 1000 characters"),
  y: z.string({ message: "name the y column" }).min(1, "name the y column").max(1000, "a column name has at most 1000 characters"),
  points: z.coerce.number().int().min(10).max(20_000).default(1500),
});
