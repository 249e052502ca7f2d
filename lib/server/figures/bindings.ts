import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, datasets, versions, type Binding, type BoundInput } from "@/db/schema";
import { decodeColumnar } from "@/lib/data/columnar";
import { tableOf, tableOfRows, type RowTable } from "@/lib/data/table-rows";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { parameterRows, storedParameters } from "@/lib/figures/fit-value";
import { sha256Hex } from "../crypto";
import { badRequest } from "@/lib/errors";
import { columnsFor } from "../datasets/columns-cache";

/** Checks every binding belongs to this manuscript and records what it points at, by content hash. */
export async function resolveBindings(manuscriptId: string, bindings: Record<string, Binding>): Promise<Record<string, BoundInput>> {
  const out: Record<string, BoundInput> = {};
  for (const [name, b] of Object.entries(bindings)) {
    if ("versionId" in b) {
      const [v] = await getDb()
        .select({ id: versions.id, sha: versions.sha256, m: datasets.manuscriptId })
        .from(versions)
        .innerJoin(datasets, eq(datasets.id, versions.datasetId))
        .where(eq(versions.id, b.versionId));
      if (!v || v.m !== manuscriptId) throw badRequest(`bindings.${name}.versionId: no such version in this manuscript.`);
      out[name] = { kind: "version", id: v.id, versionId: v.id, sha256: v.sha };
    } else {
      const [a] = await getDb()
        .select({ id: analyses.id, m: analyses.manuscriptId, derived: analyses.derivedVersionId, model: analyses.model, result: analyses.result })
        .from(analyses)
        .where(eq(analyses.id, b.analysisId));
      if (!a || a.m !== manuscriptId || !a.derived) throw badRequest(`bindings.${name}.analysisId: no such analysis in this manuscript.`);
      const [v] = await getDb().select({ sha: versions.sha256 }).from(versions).where(eq(versions.id, a.derived));
      out[name] = { kind: "analysis", id: a.id, versionId: a.derived, sha256: v.sha, output: b.output };
      if (b.output === "parameters") out[name].resultSha256 = sha256Hex(canonicalJson(parameterRows(a.model, storedParameters(a.result))));
    }
  }
  return out;
}

/** SHA-256 of the canonical spec plus the content hashes of everything it binds: what approvals sign. */
export function revisionContentHash(spec: unknown, bound: Record<string, BoundInput>): string {
  const hashes = Object.fromEntries(
    Object.entries(bound).map(([n, b]) => [n, `${b.kind}:${b.sha256}${b.output ? `:${b.output}` : ""}${b.resultSha256 ? `:${b.resultSha256}` : ""}`]),
  );
  return sha256Hex(canonicalJson({ spec, bindings: hashes }));
}

/** The `series` value of the rows each analysis output binds (the derived file is long format). */
export const SERIES: Record<string, string> = { curve: "curve", residuals: "residual", data: "data" };

/** The table each data name resolves to, full resolution, read from the parsed columns (no object per row). */
export async function loadBoundTables(bound: Record<string, BoundInput>): Promise<Record<string, RowTable>> {
  const out: Record<string, RowTable> = {};
  for (const [name, b] of Object.entries(bound)) {
    if (b.output === "parameters") {
      const [a] = await getDb().select({ model: analyses.model, result: analyses.result }).from(analyses).where(eq(analyses.id, b.id));
      out[name] = tableOfRows(parameterRows(a.model, storedParameters(a.result)));
      continue;
    }
    const [v] = await getDb().select({ sha: versions.sha256, fileName: versions.fileName }).from(versions).where(eq(versions.id, b.versionId));
    out[name] = tableOf(decodeColumnar(await columnsFor(v.sha, v.fileName)), b.output ? SERIES[b.output] : null);
  }
  return out;
}
