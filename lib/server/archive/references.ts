import "server-only";
import { and, eq, gte, inArray } from "drizzle-orm";
import type { Executor } from "@/db/client";
import { analyses, datasets, decisions, figures, panels, revisions, signoffs, threads, versions } from "@/db/schema";
import { letterFor } from "../figures/scope";

export type ArchiveKind = "dataset" | "analysis" | "panel" | "figure";

/** Every revision of a manuscript with where it sits ("Figure 2b, revision 3") and what it binds. */
async function revisionsOf(tx: Executor, manuscriptId: string) {
  const rows = await tx
    .select({ rev: revisions, panelId: panels.id, figureId: figures.id, figureNumber: figures.number })
    .from(revisions)
    .innerJoin(panels, eq(panels.id, revisions.panelId))
    .innerJoin(figures, eq(figures.id, panels.figureId))
    .where(eq(figures.manuscriptId, manuscriptId));
  const figIds = [...new Set(rows.map((r) => r.figureId))];
  const order = figIds.length
    ? await tx.select({ id: panels.id, figureId: panels.figureId, position: panels.position }).from(panels).where(inArray(panels.figureId, figIds))
    : [];
  const letterOf = (panelId: string, figureId: string) => {
    const sibs = order.filter((p) => p.figureId === figureId).sort((a, b) => a.position - b.position);
    return letterFor(sibs.findIndex((p) => p.id === panelId));
  };
  return rows.map((r) => ({ ...r, label: `Figure ${r.figureNumber}${letterOf(r.panelId, r.figureId)}, revision ${r.rev.number}` }));
}

/**
 * What still names a thing, in words; permanent deletion is refused while anything does. A dataset:
 * a revision binding one of its versions, an analysis run on one, or the stored run whose output it holds.
 * An analysis: a revision binding it or its output. A panel: decisions, threads, a sign-off of its
 * figure made since it was added. A figure: any sign-off (withdrawn ones too), and its panels' decisions and threads.
 */
export async function referencesTo(tx: Executor, kind: ArchiveKind, id: string, manuscriptId: string): Promise<string[]> {
  const refs: string[] = [];
  if (kind === "dataset" || kind === "analysis") {
    const revs = await revisionsOf(tx, manuscriptId);
    if (kind === "dataset") {
      const vs = await tx.select({ id: versions.id, number: versions.number }).from(versions).where(eq(versions.datasetId, id));
      const ids = new Set(vs.map((v) => v.id));
      for (const r of revs) if (Object.values(r.rev.bound).some((b) => ids.has(b.versionId))) refs.push(`${r.label} binds a version of it`);
      const runs = ids.size
        ? await tx
            .select()
            .from(analyses)
            .where(inArray(analyses.versionId, [...ids]))
        : [];
      for (const a of runs) refs.push(`the stored ${a.model} run ${a.id} was fitted to version ${vs.find((v) => v.id === a.versionId)!.number}`);
      const outputs = ids.size
        ? await tx
            .select()
            .from(analyses)
            .where(inArray(analyses.derivedVersionId, [...ids]))
        : [];
      for (const a of outputs) refs.push(`it holds the output of the stored ${a.model} run ${a.id}`);
    } else {
      const [a] = await tx.select().from(analyses).where(eq(analyses.id, id));
      for (const r of revs)
        if (Object.values(r.rev.bound).some((b) => (b.kind === "analysis" && b.id === id) || b.versionId === a.derivedVersionId))
          refs.push(`${r.label} binds it`);
    }
    return [...new Set(refs)];
  }
  const panelIds = kind === "panel" ? [id] : (await tx.select({ id: panels.id }).from(panels).where(eq(panels.figureId, id))).map((p) => p.id);
  const [owner] = kind === "panel" ? await tx.select({ figureId: panels.figureId, createdAt: panels.createdAt }).from(panels).where(eq(panels.id, id)) : [];
  const figureId = owner?.figureId ?? id;
  const [decs, threadRows, signs] = await Promise.all([
    panelIds.length ? tx.select({ id: decisions.id }).from(decisions).where(inArray(decisions.panelId, panelIds)) : [],
    panelIds.length ? tx.select({ id: threads.id }).from(threads).where(inArray(threads.panelId, panelIds)) : [],
    // A panel is named by the sign-offs of its figure made while it was there (their figure hash covers it).
    tx
      .select({ id: signoffs.id })
      .from(signoffs)
      .where(owner ? and(eq(signoffs.figureId, figureId), gte(signoffs.createdAt, owner.createdAt)) : eq(signoffs.figureId, figureId)),
  ]);
  if (decs.length) refs.push(`${decs.length} review decision${decs.length === 1 ? "" : "s"}`);
  if (threadRows.length) refs.push(`${threadRows.length} thread${threadRows.length === 1 ? "" : "s"}`);
  if (signs.length) refs.push(`${signs.length} sign-off${signs.length === 1 ? "" : "s"} of the figure`);
  return refs;
}

/** The row, its manuscript and a name for the audit log ("dataset “Echo NV03”"). */
export async function describeTarget(tx: Executor, kind: ArchiveKind, id: string) {
  if (kind === "dataset") {
    const [d] = await tx.select().from(datasets).where(eq(datasets.id, id));
    return d && { manuscriptId: d.manuscriptId, archivedAt: d.archivedAt, what: `dataset “${d.name}”` };
  }
  if (kind === "analysis") {
    const [a] = await tx.select().from(analyses).where(eq(analyses.id, id));
    return a && { manuscriptId: a.manuscriptId, archivedAt: a.archivedAt, what: `the stored ${a.model} run ${a.id}` };
  }
  if (kind === "figure") {
    const [f] = await tx.select().from(figures).where(eq(figures.id, id));
    return f && { manuscriptId: f.manuscriptId, archivedAt: f.archivedAt, what: `Figure ${f.number}${f.title ? ` “${f.title}”` : ""}` };
  }
  const [p] = await tx.select({ p: panels, f: figures }).from(panels).innerJoin(figures, eq(figures.id, panels.figureId)).where(eq(panels.id, id));
  return p && { manuscriptId: p.f.manuscriptId, archivedAt: p.p.archivedAt, what: `a panel of Figure ${p.f.number}${p.p.title ? ` (“${p.p.title}”)` : ""}` };
}
