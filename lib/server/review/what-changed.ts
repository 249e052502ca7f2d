import "server-only";
import { inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { revisions, versions, type BoundInput } from "@/db/schema";
import { canonicalJson } from "@/lib/figures/canonical-spec";

export interface Change {
  kind: "spec" | "data" | "analysis" | "binding";
  text: string;
  name?: string;
  from?: unknown;
  to?: unknown;
}

type Rev = typeof revisions.$inferSelect;

/** What differs between the revision a decision was made on and the current one, in words. */
export async function describeChanges(from: Rev, to: Rev): Promise<Change[]> {
  const out: Change[] = [];
  if (canonicalJson(JSON.parse(from.spec)) !== canonicalJson(JSON.parse(to.spec)))
    out.push({ kind: "spec", text: `the spec changed (revision ${from.number} → ${to.number})` });
  const ids = [...new Set([...Object.values(from.bound), ...Object.values(to.bound)].map((b) => b.versionId))];
  const vs = ids.length
    ? await getDb().select({ id: versions.id, number: versions.number, datasetId: versions.datasetId }).from(versions).where(inArray(versions.id, ids))
    : [];
  const num = (b: BoundInput) => vs.find((v) => v.id === b.versionId);
  for (const name of new Set([...Object.keys(from.bound), ...Object.keys(to.bound)])) {
    const a = from.bound[name];
    const b = to.bound[name];
    if (!a || !b) {
      out.push({ kind: "binding", name, text: `data "${name}" was ${a ? "removed" : "added"}` });
      continue;
    }
    if (a.sha256 === b.sha256 && a.output === b.output) continue;
    if (a.kind === "analysis" || b.kind === "analysis")
      out.push({ kind: "analysis", name, text: `data "${name}": the analysis changed (${a.id} → ${b.id})`, from: a.id, to: b.id });
    else {
      const va = num(a),
        vb = num(b);
      const same = va && vb && va.datasetId === vb.datasetId;
      out.push({
        kind: "data",
        name,
        text: same ? `data "${name}": version ${va.number} → ${vb.number}` : `data "${name}" now points at another dataset`,
        from: a.versionId,
        to: b.versionId,
      });
    }
  }
  return out;
}
