import "server-only";
import { and, desc, eq, isNull, max } from "drizzle-orm";
import { getDb } from "@/db/client";
import { panels, revisions, users } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { validateSpec } from "@/lib/figures/validate-spec";
import { appendAudit } from "../audit";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { newId } from "../crypto";
import { badRequest, conflict, notFound, unprocessable } from "@/lib/errors";
import { resolveBindings, revisionContentHash } from "./bindings";
import { fieldProblems } from "./integrity";
import { revisionInput, type RevisionInput } from "./schemas";
import { manuscriptOfPanel } from "./scope";
import { noticeNewRevision } from "../review/review-notices";
import { describeChanges } from "../review/what-changed";

/**
 * A new immutable revision. `baseRevisionId` must be the current one (null for the first);
 * otherwise 409, so two editors never overwrite each other silently.
 */
export async function createRevision(user: SessionUser, panelId: string, raw: RevisionInput) {
  const manuscriptId = await manuscriptOfPanel(panelId);
  await authorize(user, "figure.edit", manuscriptId);
  const input = revisionInput.parse(raw);
  const checked = validateSpec(input.spec);
  if (!checked.ok)
    throw unprocessable(
      `spec: ${checked.errors
        .slice(0, 3)
        .map((e) => `${e.path}: ${e.message}`)
        .join("; ")}`,
      checked.errors,
    );
  const missing = checked.dataNames.filter((n) => !(n in input.bindings));
  if (missing.length) throw badRequest(`bindings: the spec uses data ${missing.map((m) => `"${m}"`).join(", ")} with no binding.`);
  const bound = await resolveBindings(manuscriptId, input.bindings);
  // A field the bound data lacks draws an empty plot without any error: refused like other spec errors.
  const problems = await fieldProblems(input.spec, bound);
  if (problems.length)
    throw unprocessable(
      `spec: ${problems
        .slice(0, 3)
        .map((p) => `${p.path}: ${p.message}`)
        .join("; ")}`,
      problems,
    );
  const spec = JSON.parse(canonicalJson(input.spec)) as unknown;
  const contentHash = revisionContentHash(spec, bound);
  const id = newId();
  const [previous] = input.baseRevisionId ? await getDb().select().from(revisions).where(eq(revisions.id, input.baseRevisionId)) : [];
  await getDb().transaction(async (tx) => {
    const [p] = await tx.select().from(panels).where(eq(panels.id, panelId));
    if (p.archivedAt) throw conflict("This panel is archived; restore it before saving a revision.");
    if ((p.currentRevisionId ?? null) !== input.baseRevisionId)
      throw conflict(
        `This panel changed since you opened it: the current revision is ${p.currentRevisionId ?? "none"}, you edited ${input.baseRevisionId ?? "none"}. Reload and apply your change again.`,
        { currentRevisionId: p.currentRevisionId },
      );
    const [{ n } = { n: 0 }] = await tx
      .select({ n: max(revisions.number) })
      .from(revisions)
      .where(eq(revisions.panelId, panelId));
    await tx.insert(revisions).values({
      id,
      panelId,
      number: (n ?? 0) + 1,
      spec: canonicalJson(spec),
      bindings: input.bindings,
      bound,
      message: input.message,
      contentHash,
      createdBy: user.id,
    });
    const moved = await tx
      .update(panels)
      .set({ currentRevisionId: id })
      .where(and(eq(panels.id, panelId), input.baseRevisionId ? eq(panels.currentRevisionId, input.baseRevisionId) : isNull(panels.currentRevisionId)))
      .returning({ id: panels.id });
    if (!moved[0]) throw conflict("This panel changed while you saved. Reload and apply your change again.");
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId,
      action: "panel.revise",
      target: `revision:${id}`,
      data: { panelId, contentHash, number: (n ?? 0) + 1, message: input.message },
    });
    const [rev] = await tx.select().from(revisions).where(eq(revisions.id, id));
    await noticeNewRevision(tx, user, rev, previous ?? null, previous ? await describeChanges(previous, rev) : []);
  });
  return getRevision(user, id);
}

export async function getRevision(user: SessionUser, revisionId: string) {
  const [r] = await getDb().select().from(revisions).where(eq(revisions.id, revisionId));
  if (!r) throw notFound();
  await authorize(user, "manuscript.read", await manuscriptOfPanel(r.panelId));
  return { ...r, spec: JSON.parse(r.spec) as unknown };
}

export async function listRevisions(user: SessionUser, panelId: string) {
  await authorize(user, "manuscript.read", await manuscriptOfPanel(panelId));
  const rows = await getDb()
    .select({ r: revisions, by: users.name })
    .from(revisions)
    .innerJoin(users, eq(users.id, revisions.createdBy))
    .where(eq(revisions.panelId, panelId))
    .orderBy(desc(revisions.number));
  return rows.map(({ r, by }) => ({
    id: r.id,
    number: r.number,
    message: r.message,
    contentHash: r.contentHash,
    createdAt: r.createdAt,
    createdBy: r.createdBy,
    createdByName: by,
    bound: r.bound,
  }));
}
