import "server-only";
import { and, desc, eq, inArray, isNull } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { analyses, datasets, versions } from "@/db/schema";
import { FitInputError } from "@/lib/analysis/fit-input-error";
import { fitDecouplingScaling, scalingCurve } from "@/lib/analysis/scaling/decoupling-scaling";
import { authorize, type SessionUser } from "@/lib/authz";
import { badRequest } from "@/lib/errors";

/** Pulse numbers past this are not a decoupling sequence anyone runs (common practice: XY-8 trains reach a few thousand). */
const MAX_PULSES = 100_000;

export const scalingInput = z
  .object({
    manuscriptId: z.string().min(1, "manuscriptId is required").max(128),
    /** The fitted parameter taken from each run (T2 of a Hahn echo fit). */
    parameter: z.string().min(1).max(100).default("T2"),
    runs: z
      .array(
        z
          .object({
            analysisId: z.string().min(1, "analysisId is required").max(128),
            pulses: z
              .number()
              .int("the number of π pulses is a whole number")
              .min(1, "the number of π pulses is at least 1")
              .max(MAX_PULSES, `at most ${MAX_PULSES} π pulses`),
          })
          .strict(),
      )
      .min(3, "choose at least 3 stored runs")
      .max(200, "at most 200 runs"),
  })
  .strict();
type ScalingInput = z.input<typeof scalingInput>;

interface StoredParameter {
  name: string;
  value: number | null;
  stderr: number | null;
  unit: string | null;
  fixed?: boolean;
}

/**
 * Fits T₂(N) = T₂(1)·N^s to stored runs (one point per run: its fitted parameter ± standard error,
 * N as given per run). Nothing is stored; the result names each run with its dataset.
 */
export async function fitScaling(user: SessionUser, raw: ScalingInput) {
  const input = scalingInput.parse(raw);
  await authorize(user, "analysis.run", input.manuscriptId);
  const ids = input.runs.map((r) => r.analysisId);
  const seen = new Set<string>();
  ids.forEach((id, i) => {
    if (seen.has(id)) throw badRequest(`runs.${i}.analysisId: run ${id} is chosen twice`);
    seen.add(id);
  });
  const rows = await getDb()
    .select({ a: analyses, name: datasets.name, tags: datasets.tags })
    .from(analyses)
    .innerJoin(versions, eq(versions.id, analyses.versionId))
    .innerJoin(datasets, eq(datasets.id, versions.datasetId))
    .where(inArray(analyses.id, ids));
  const byId = new Map(rows.map((r) => [r.a.id, r]));
  let unit: string | null | undefined;
  const points = input.runs.map((run, i) => {
    const row = byId.get(run.analysisId);
    if (!row || row.a.manuscriptId !== input.manuscriptId) throw badRequest(`runs.${i}.analysisId: no stored run ${run.analysisId} in this manuscript`);
    const params = (row.a.result as { parameters?: StoredParameter[] }).parameters ?? [];
    const p = params.find((q) => q.name === input.parameter);
    if (!p) throw badRequest(`runs.${i}.analysisId: the run (${row.a.model}) has no parameter ${input.parameter}`);
    if (p.fixed) throw badRequest(`runs.${i}.analysisId: ${input.parameter} was held fixed in this run, so it has no error to weight by`);
    if (p.value === null || p.stderr === null || !(p.stderr > 0))
      throw badRequest(`runs.${i}.analysisId: ${input.parameter} of this run has no standard error (not determined by its data)`);
    if (unit === undefined) unit = p.unit;
    else if (p.unit !== unit)
      throw badRequest(`runs.${i}.analysisId: ${input.parameter} is in ${p.unit ?? "no unit"}, the first run's in ${unit ?? "no unit"}`);
    return { analysisId: run.analysisId, dataset: row.name, model: row.a.model, pulses: run.pulses, value: p.value, stderr: p.stderr };
  });
  let fit;
  try {
    fit = fitDecouplingScaling(points.map((p) => ({ pulses: p.pulses, t2: p.value, stderr: p.stderr })));
  } catch (err) {
    if (err instanceof FitInputError) throw badRequest(`${err.field.replace(/^points\[(\d+)\]\.?\w*/, "runs.$1").replace(/^points$/, "runs")}: ${err.message}`);
    throw err;
  }
  const lo = Math.min(...points.map((p) => p.pulses));
  const hi = Math.max(...points.map((p) => p.pulses));
  const grid = Array.from({ length: 41 }, (_, k) => lo * (hi / lo) ** (k / 40));
  return {
    parameter: input.parameter,
    unit: unit ?? null,
    formula: `${input.parameter}(N) = ${input.parameter}(1)·N^s`,
    weighting: "weighted by each run's standard error, taken as absolute; errors scaled by √χ²ᵣ given beside",
    points,
    fit,
    curve: { pulses: grid, value: scalingCurve(fit, grid) },
  };
}

/** A tag value read as a pulse count ("16", "XY8-16" → 16 is not guessed: only a plain whole number counts). */
function pulsesFromTags(tags: Record<string, string>): number | null {
  const raw = tags.pulses ?? tags.N;
  return raw !== undefined && /^\d+$/.test(raw.trim()) && Number(raw) >= 1 ? Number(raw) : null;
}

/**
 * Stored runs of the manuscript (not archived) with a fitted T₂ that has a standard error, newest first,
 * each with the pulse count its dataset's tags give (`pulses`), for choosing points of a scaling fit.
 */
export async function scalingCandidates(user: SessionUser, manuscriptId: string, parameter = "T2") {
  await authorize(user, "manuscript.read", manuscriptId);
  const rows = await getDb()
    .select({ a: analyses, name: datasets.name, tags: datasets.tags, number: versions.number })
    .from(analyses)
    .innerJoin(versions, eq(versions.id, analyses.versionId))
    .innerJoin(datasets, eq(datasets.id, versions.datasetId))
    .where(and(eq(analyses.manuscriptId, manuscriptId), isNull(analyses.archivedAt)))
    .orderBy(desc(analyses.createdAt));
  return rows.flatMap(({ a, name, tags, number }) => {
    const p = ((a.result as { parameters?: StoredParameter[] }).parameters ?? []).find((q) => q.name === parameter);
    if (!p || p.fixed || p.value === null || p.stderr === null || !(p.stderr > 0)) return [];
    return [
      { analysisId: a.id, dataset: name, versionNumber: number, model: a.model, value: p.value, stderr: p.stderr, unit: p.unit, pulses: pulsesFromTags(tags) },
    ];
  });
}
export type ScalingCandidate = Awaited<ReturnType<typeof scalingCandidates>>[number];
