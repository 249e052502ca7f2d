import { z } from "zod";
import { MEASUREMENT_KINDS } from "@/db/schema";

export const metadataInput = z.object({
  kind: z.enum(MEASUREMENT_KINDS, { message: `kind must be one of ${MEASUREMENT_KINDS.join(", ")}.` }).optional(),
  sample: z.string().trim().max(200).nullable().optional(),
  instrument: z.string().trim().max(200).nullable().optional(),
  measuredAt: z.string().trim().max(40).refine((s) => !s || !Number.isNaN(Date.parse(s)), "measuredAt must be a date such as 2026-03-14 or 2026-03-14T10:30:00Z.").nullable().optional(),
  notes: z.string().max(10_000).nullable().optional(),
  tags: z.record(z.string().trim().min(1).max(60), z.string().max(200)).refine((t) => Object.keys(t).length <= 50, "at most 50 tags").optional(),
}).strict();
export type MetadataInput = z.infer<typeof metadataInput>;

export const uploadFields = z.object({
  name: z.string().trim().min(1, "give the dataset a name.").max(200).optional(),
  datasetId: z.string().min(1).optional(),
  metadata: z.string().optional(),
  delimiter: z.enum([",", ";", "\t", "whitespace", "tab"]).optional(),
  decimal: z.enum([".", ","]).optional(),
  format: z.enum(["auto", "csv", "tsv", "text", "json", "matrix"]).optional(),
});

export const rowsQuery = z.object({
  offset: z.coerce.number().int().min(0, "offset must be ≥ 0").default(0),
  limit: z.coerce.number().int().min(1).max(10_000, "limit must be at most 10,000").default(100),
});

export const plotQuery = z.object({
  x: z.string({ message: "name the x column" }).min(1, "name the x column"),
  y: z.string({ message: "name the y column" }).min(1, "name the y column"),
  points: z.coerce.number().int().min(10).max(20_000).default(1500),
});
