import "server-only";
import { z } from "zod";

/** Ids are 16 characters (newId) or short seed names; 128 leaves room and refuses megabyte strings. */
const ID_MAX = 128;

export const createFigureInput = z.object({
  manuscriptId: z.string().min(1, "manuscriptId is required").max(ID_MAX),
  title: z.string().trim().min(1, "give the figure a title").max(300),
  widthMm: z.number().min(30, "widthMm must be at least 30 mm").max(300, "widthMm must be at most 300 mm").optional(),
  maxHeightMm: z.number().min(30).max(300).optional(),
  columns: z.number().int().min(1).max(6).optional(),
  shareYTitles: z.boolean({ message: "shareYTitles must be true or false" }).optional(),
});

const FIGURE_FIELDS = ["title", "widthMm", "maxHeightMm", "columns", "shareYTitles", "requiredReviewers"] as const;

/** A PATCH must change something: an empty update would reach the database as `SET` with nothing to set. */
export const updateFigureInput = createFigureInput
  .omit({ manuscriptId: true })
  .partial()
  .extend({
    requiredReviewers: z.array(z.string().min(1).max(ID_MAX)).max(50).optional(),
  })
  .refine((p) => FIGURE_FIELDS.some((k) => p[k] !== undefined), `name at least one of ${FIGURE_FIELDS.join(", ")} to change.`);

export const addPanelInput = z.object({
  title: z.string().trim().max(200).optional(),
  colSpan: z.number().int().min(1).max(6).optional(),
});

export const reorderInput = z.object({ panelIds: z.array(z.string().min(1).max(ID_MAX)).min(1).max(200) });

const binding = z.union([
  z.object({ versionId: z.string().min(1).max(ID_MAX) }).strict(),
  z
    .object({
      analysisId: z.string().min(1).max(ID_MAX),
      output: z.enum(["curve", "residuals", "data", "parameters"], { message: "output must be curve, residuals, data or parameters" }),
    })
    .strict(),
]);

export const revisionInput = z.object({
  spec: z.record(z.string(), z.unknown(), { message: "spec must be a Vega-Lite JSON object" }),
  bindings: z
    .record(z.string().min(1).max(200), binding)
    .refine((b) => Object.keys(b).length <= 100, "at most 100 bindings")
    .default({}),
  baseRevisionId: z.string().min(1).max(ID_MAX).nullable(),
  message: z.string().trim().max(2000).default("").describe("The revision note: what changed and why, for the co-authors"),
});
export type RevisionInput = z.infer<typeof revisionInput>;
