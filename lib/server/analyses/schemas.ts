import { z } from "zod";

const finite = z.number().refine(Number.isFinite, "must be a finite number");

export const fitOptions = z.object({
  x: z.string({ message: "name the x column" }).min(1),
  y: z.string({ message: "name the y column" }).min(1),
  sigma: z.string().min(1).optional(),
  start: z.record(z.string(), finite).optional(),
  fixed: z.record(z.string(), finite).optional(),
  bounds: z.record(z.string(), z.tuple([z.number(), z.number()])).optional(),
  /** Fit only points with x in [lo, hi] (x column units). */
  xRange: z.tuple([finite, finite]).optional(),
  maxIterations: z.number().int().min(1).max(5000).optional(),
}).strict();
export type FitOptions = z.infer<typeof fitOptions>;

export const analysisInput = z.object({
  versionId: z.string().min(1, "versionId is required"),
  model: z.string().min(1, "model is required"),
  options: fitOptions,
});
export type AnalysisInput = z.infer<typeof analysisInput>;

export const statisticsQuery = z.object({
  model: z.string().min(1),
  parameter: z.string().min(1),
  groupBy: z.string().min(1).default("group"),
});

export const calculatorInput = z.object({ inputs: z.record(z.string(), z.unknown()) });
