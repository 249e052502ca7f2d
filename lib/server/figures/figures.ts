import "server-only";
import { and, asc, eq, isNotNull, max } from "drizzle-orm";
import { getDb } from "@/db/client";
import { figures, manuscriptMembers, panels, type Role } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { appendAudit } from "../audit";
import { houseStyleOf } from "../house-style";
import { newId } from "../crypto";
import { badRequest, notFound } from "@/lib/errors";
import { createFigureInput, reorderInput, updateFigureInput } from "./schemas";
import { manuscriptOfFigure } from "./scope";
import { loadReviewContext, type FigureReview } from "../review/review-context";
import { warningsByRevision } from "./integrity";
import { z } from "zod";

export async function createFigure(user: SessionUser, raw: z.infer<typeof createFigureInput>) {
  const input = createFigureInput.parse(raw);
  await authorize(user, "figure.edit", input.manuscriptId);
  const id = newId();
  await getDb().transaction(async (tx) => {
    const [{ n } = { n: 0 }] = await tx
      .select({ n: max(figures.number) })
      .from(figures)
      .where(eq(figures.manuscriptId, input.manuscriptId));
    await tx.insert(figures).values({
      id,
      manuscriptId: input.manuscriptId,
      number: (n ?? 0) + 1,
      title: input.title,
      widthMm: input.widthMm ?? 183,
      maxHeightMm: input.maxHeightMm ?? 170,
      columns: input.columns ?? 2,
      shareYTitles: input.shareYTitles ?? false,
      createdBy: user.id,
    });
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId: input.manuscriptId,
      action: "figure.create",
      target: `figure:${id}`,
      data: { title: input.title },
    });
  });
  return getFigure(user, id);
}

export async function updateFigure(user: SessionUser, figureId: string, raw: z.infer<typeof updateFigureInput>) {
  const manuscriptId = await manuscriptOfFigure(figureId);
  await authorize(user, "figure.edit", manuscriptId);
  const patch = updateFigureInput.parse(raw);
  if (patch.requiredReviewers?.length) {
    const members = await getDb()
      .select({ id: manuscriptMembers.userId, role: manuscriptMembers.role })
      .from(manuscriptMembers)
      .where(eq(manuscriptMembers.manuscriptId, manuscriptId));
    const bad = patch.requiredReviewers.find((u) => !members.some((m) => m.id === u && m.role !== "viewer"));
    if (bad) throw badRequest(`requiredReviewers: "${bad}" is not a member who may review (PI, author or reviewer).`);
  }
  await getDb().transaction(async (tx) => {
    await tx.update(figures).set(patch).where(eq(figures.id, figureId));
    await appendAudit(tx, { actorId: user.id, manuscriptId, action: "figure.update", target: `figure:${figureId}`, data: patch });
  });
  return getFigure(user, figureId);
}

/** A figure with its panels in order, each with its letter, current revision and derived review state. */
export async function getFigure(user: SessionUser, figureId: string) {
  const manuscriptId = await manuscriptOfFigure(figureId);
  const role = await authorize(user, "manuscript.read", manuscriptId);
  const [review] = await loadReviewContext({ figureId });
  if (!review) throw notFound();
  // Archived panels have left the figure; listed apart so they can be opened and restored.
  const archivedPanels = await getDb()
    .select({ id: panels.id, title: panels.title, archivedAt: panels.archivedAt })
    .from(panels)
    .where(and(eq(panels.figureId, figureId), isNotNull(panels.archivedAt)))
    .orderBy(asc(panels.position));
  return { ...presentFigure(review, role, await dataWarningCounts([review])), archivedPanels, houseStyle: await houseStyleOf(manuscriptId) };
}

/** Data warnings (lib/server/figures/integrity) per current revision id, counted. */
export async function dataWarningCounts(reviews: FigureReview[]): Promise<Map<string, number>> {
  const revs = reviews.flatMap((r) => r.panels.flatMap((p) => (p.revision ? [p.revision] : [])));
  const warnings = await warningsByRevision(revs);
  return new Map([...warnings].map(([id, w]) => [id, w.length]));
}

function presentFigure(review: FigureReview, role: Role | null, warningCounts: Map<string, number>) {
  return {
    ...review.figure,
    role,
    figureHash: review.figureHash,
    reviewState: review.state,
    signoffs: review.signoffs,
    panels: review.panels.map((p) => ({
      id: p.panel.id,
      letter: p.letter,
      title: p.panel.title,
      colSpan: p.panel.colSpan,
      position: p.panel.position,
      currentRevision: p.revision
        ? {
            id: p.revision.id,
            number: p.revision.number,
            contentHash: p.revision.contentHash,
            message: p.revision.message,
            createdAt: p.revision.createdAt,
            createdBy: p.revision.createdBy,
          }
        : null,
      reviewState: p.state,
      approvedBy: p.approvedBy,
      needsRevisionBy: p.needsRevisionBy,
      waitingOn: p.waitingOn,
      openThreads: p.openThreads,
      dataWarnings: p.revision ? (warningCounts.get(p.revision.id) ?? 0) : 0,
    })),
  };
}

/** The manuscript's figures; archived ones only when `archived` asks for them (then only those). */
export async function listFiguresForManuscript(user: SessionUser, manuscriptId: string, knownRole?: Role | null, archived = false) {
  const role = knownRole ?? (await authorize(user, "manuscript.read", manuscriptId));
  const reviews = await loadReviewContext({ manuscriptId, archived }, undefined, "latest-on-current");
  return presentFigures(reviews, role, await dataWarningCounts(reviews));
}

/** Figures as a member with `role` sees them; `reviews` may be shared (cached), so nothing in it is changed. */
export function presentFigures(reviews: FigureReview[], role: Role | null, warningCounts: Map<string, number>) {
  return reviews.map((r) => presentFigure(r, role, warningCounts));
}

/** Reorders panels; letters follow the new order. */
export async function reorderPanels(user: SessionUser, figureId: string, raw: z.infer<typeof reorderInput>) {
  const manuscriptId = await manuscriptOfFigure(figureId);
  await authorize(user, "figure.edit", manuscriptId);
  const { panelIds } = reorderInput.parse(raw);
  await getDb().transaction(async (tx) => {
    const existing = await tx.select({ id: panels.id }).from(panels).where(eq(panels.figureId, figureId));
    const ids = new Set(existing.map((p) => p.id));
    if (panelIds.length !== ids.size || new Set(panelIds).size !== panelIds.length || !panelIds.every((p) => ids.has(p)))
      throw badRequest("panelIds: list every panel of the figure exactly once.");
    for (const [i, pid] of panelIds.entries())
      await tx
        .update(panels)
        .set({ position: i })
        .where(and(eq(panels.id, pid), eq(panels.figureId, figureId)));
    await appendAudit(tx, { actorId: user.id, manuscriptId, action: "figure.reorder", target: `figure:${figureId}`, data: { panelIds } });
  });
  return getFigure(user, figureId);
}
