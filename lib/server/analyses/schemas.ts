import "server-only";
import { z } from "zod";

/** Column names come from uploaded files; model and parameter names from our own catalogue. */
const COLUMN_MAX = 1000;
const NAME_MAX = 100;
const BOOTSTRAP_MAX_DRAWS = 5000;

const finite = z.number().refine(Number.isFinite, "must be a finite number");

const fitOptions = z
  .object({
    x: z.string({ message: "name the x column" }).min(1, "name the x column").max(COLUMN_MAX, `a column name has at most ${COLUMN_MAX} characters`),
    y: z.string({ message: "name the y column" }).min(1, "name the y column").max(COLUMN_MAX, `a column name has at most ${COLUMN_MAX} characters`),
    sigma: z.string().min(1).max(COLUMN_MAX).optional(),
    start: z.record(z.string().max(NAME_MAX), finite).optional(),
    fixed: z.record(z.string().max(NAME_MAX), finite).optional(),
    bounds: z.record(z.string().max(NAME_MAX), z.tuple([z.number(), z.number()])).optional(),
    /** Fit only points with x in [lo, hi] (x column units). */
    xRange: z
      .tuple([finite, finite])
      .refine(([lo, hi]) => lo < hi, "the fit window's start must be below its end")
      .optional(),
    maxIterations: z.number().int().min(1).max(5000).optional(),
    /** Percentile intervals from a residual-resampling bootstrap beside the covariance errors. */
    bootstrap: z
      .object({
        draws: z.number().int().min(100, "at least 100 bootstrap draws").max(BOOTSTRAP_MAX_DRAWS, `at most ${BOOTSTRAP_MAX_DRAWS} bootstrap draws`),
        seed: z
          .number()
          .int()
          .min(0)
          .max(2 ** 32 - 1),
      })
      .strict()
      .optional(),
  })
  .strict();
export type FitOptions = z.infer<typeof fitOptions>;

export const analysisInput = z.object({
  versionId: z.string().min(1, "versionId is required").max(128),
  model: z.string().min(1, "model is required").max(NAME_MAX),
  options: fitOptions,
});
export type AnalysisInput = z.infer<typeof analysisInput>;

/** Global fit: one model over several versions at once, the named parameters shared by all (nothing is stored). */
export const globalInput = z
  .object({
    manuscriptId: z.string().min(1, "manuscriptId is required").max(128),
    versionIds: z.array(z.string().min(1).max(128)).min(2, "choose at least two versions").max(50, "at most 50 versions in one global fit"),
    model: z.string().min(1, "model is required").max(NAME_MAX),
    shared: z.array(z.string().min(1).max(NAME_MAX)).max(20),
    options: fitOptions.omit({ bootstrap: true }),
  })
  .strict();
export type GlobalInput = z.infer<typeof globalInput>;

/** Batch: one model and one set of options over the current versions of several datasets of one manuscript. */
export const batchInput = z
  .object({
    manuscriptId: z.string().min(1, "manuscriptId is required").max(128),
    versionIds: z.array(z.string().min(1).max(128)).min(1, "choose at least one version").max(1000, "at most 1000 versions in one batch"),
    model: z.string().min(1, "model is required").max(NAME_MAX),
    options: fitOptions,
  })
  .strict();
export type BatchInput = z.infer<typeof batchInput>;

export const statisticsQuery = z.object({
  model: z.string().min(1).max(NAME_MAX),
  parameter: z.string().min(1).max(NAME_MAX),
  groupBy: z.string().min(1).max(200).default("group"),
});

export const calculatorInput = z.object({ inputs: z.record(z.string().max(NAME_MAX), z.unknown()) });

/** Model comparison: two to four candidates fitted to the same columns of one version (nothing is stored). */
const comparisonCandidate = z
  .object({
    label: z.string().trim().min(1, "give each candidate a label").max(NAME_MAX, `a label has at most ${NAME_MAX} characters`),
    model: z.string().min(1, "model is required").max(NAME_MAX),
    start: z.record(z.string().max(NAME_MAX), finite).optional(),
    fixed: z.record(z.string().max(NAME_MAX), finite).optional(),
    bounds: z.record(z.string().max(NAME_MAX), z.tuple([z.number(), z.number()])).optional(),
  })
  .strict();
export const comparisonInput = z
  .object({
    versionId: z.string().min(1, "versionId is required").max(128),
    options: fitOptions.pick({ x: true, y: true, sigma: true, xRange: true }),
    candidates: z.array(comparisonCandidate).min(2, "compare at least two candidates").max(4, "compare at most four candidates"),
  })
  .strict();
export type ComparisonInput = z.infer<typeof comparisonInput>;
