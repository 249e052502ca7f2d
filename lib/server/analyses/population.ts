import "server-only";
import { and, desc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, datasets, versions } from "@/db/schema";
import { getModel } from "@/lib/analysis";
import { compareGroups, COMPARE_GROUPS_METHOD, describe, DESCRIBE_METHOD } from "@/lib/analysis/stats";
import { authorize, type SessionUser } from "@/lib/authz";
import { badRequest } from "@/lib/errors";

const METADATA_FIELDS = ["kind", "sample", "instrument"] as const;

/**
 * Population statistics of one fitted parameter over the latest run of `model` on each dataset's
 * current version, grouped by a tag (e.g. "group") or a metadata field; every pair of groups compared.
 */
export async function populationStatistics(user: SessionUser, manuscriptId: string, model: string, parameter: string, groupBy: string) {
  await authorize(user, "manuscript.read", manuscriptId);
  const known = getModel(model);
  if (!known) throw badRequest(`model: unknown model "${model}"; GET /api/analysis-models lists them.`);
  if (!known.params.some((p) => p.name === parameter)) {
    throw badRequest(`parameter: model ${model} has no parameter "${parameter}" (it has ${known.params.map((p) => p.name).join(", ")}).`);
  }
  const rows = await getDb()
    .select({ a: analyses, v: versions, d: datasets })
    .from(analyses)
    .innerJoin(versions, eq(versions.id, analyses.versionId))
    .innerJoin(datasets, eq(datasets.id, versions.datasetId))
    .where(and(eq(analyses.manuscriptId, manuscriptId), eq(analyses.model, model)))
    .orderBy(desc(analyses.createdAt));
  const currentIds = await currentVersionIds([...new Set(rows.map((r) => r.d.id))]);
  const seen = new Set<string>();
  const members: Array<{ group: string; value: number; stderr: number | null; analysisId: string; dataset: string; versionNumber: number }> = [];
  let unit = "";
  for (const { a, v, d } of rows) {
    if (seen.has(d.id) || !currentIds.has(v.id)) continue;
    seen.add(d.id);
    const params = (a.result as { parameters?: Array<{ name: string; value: number | null; stderr: number | null; unit: string }> }).parameters ?? [];
    const p = params.find((q) => q.name === parameter);
    if (!p) throw badRequest(`parameter: model ${model} has no parameter "${parameter}" (it has ${params.map((q) => q.name).join(", ")}).`);
    if (p.value === null) continue;
    unit = p.unit;
    const group = (METADATA_FIELDS as readonly string[]).includes(groupBy) ? (d[groupBy as (typeof METADATA_FIELDS)[number]] ?? "—") : (d.tags[groupBy] ?? "—");
    members.push({ group, value: p.value, stderr: p.stderr, analysisId: a.id, dataset: d.name, versionNumber: v.number });
  }
  const groupNames = [...new Set(members.map((m) => m.group))].sort();
  const valuesOf = (g: string) => members.filter((m) => m.group === g).map((m) => m.value);
  const groups = groupNames.map((g) => ({ group: g, ...describe(valuesOf(g)) }));
  const comparisons = groupNames.flatMap((a, i) => groupNames.slice(i + 1).map((b) => ({ a, b, ...compareGroups(valuesOf(a), valuesOf(b)) })));
  return { model, parameter, unit, groupBy, members, groups, comparisons, methods: { describe: DESCRIBE_METHOD, compare: COMPARE_GROUPS_METHOD } };
}

/** The id of the newest version of each dataset: only runs on current data count. */
async function currentVersionIds(datasetIds: string[]): Promise<Set<string>> {
  if (!datasetIds.length) return new Set();
  const all = await getDb()
    .select({ id: versions.id, datasetId: versions.datasetId, number: versions.number })
    .from(versions)
    .where(inArray(versions.datasetId, datasetIds));
  const newest = new Map<string, { id: string; number: number }>();
  for (const v of all) if ((newest.get(v.datasetId)?.number ?? 0) < v.number) newest.set(v.datasetId, v);
  return new Set([...newest.values()].map((v) => v.id));
}
