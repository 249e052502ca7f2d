import "server-only";
import { and, asc, count, eq, isNull, max } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { decisions, panels, revisions, threads, users } from "@/db/schema";
import { panelReviewState } from "@/lib/review/derive-state";
import { authorize, type SessionUser } from "@/lib/authz";
import { appendAudit } from "../audit";
import { newId } from "../crypto";
import { notFound } from "@/lib/errors";
import { addPanelInput } from "./schemas";
import { letterFor, manuscriptOfFigure, manuscriptOfPanel } from "./scope";
import { loadReviewContext } from "../review/review-context";
import { describeChanges } from "../review/what-changed";
import { revisionWarnings } from "./integrity";

export async function addPanel(user: SessionUser, figureId: string, raw: z.infer<typeof addPanelInput>) {
  const manuscriptId = await manuscriptOfFigure(figureId);
  await authorize(user, "figure.edit", manuscriptId);
  const input = addPanelInput.parse(raw);
  const id = newId();
  await getDb().transaction(async (tx) => {
    const [{ n } = { n: null }] = await tx
      .select({ n: max(panels.position) })
      .from(panels)
      .where(eq(panels.figureId, figureId));
    await tx.insert(panels).values({ id, figureId, position: (n ?? -1) + 1, title: input.title ?? "", colSpan: input.colSpan ?? 1, createdBy: user.id });
    await appendAudit(tx, { actorId: user.id, manuscriptId, action: "panel.create", target: `panel:${id}`, data: { figureId } });
  });
  return getPanel(user, id);
}

export async function getPanel(user: SessionUser, panelId: string) {
  const manuscriptId = await manuscriptOfPanel(panelId);
  const role = await authorize(user, "manuscript.read", manuscriptId);
  const [p] = await getDb().select().from(panels).where(eq(panels.id, panelId));
  if (!p) throw notFound();
  const siblings = await getDb().select({ id: panels.id }).from(panels).where(eq(panels.figureId, p.figureId)).orderBy(asc(panels.position));
  const [rev] = p.currentRevisionId ? await getDb().select().from(revisions).where(eq(revisions.id, p.currentRevisionId)) : [];
  const [review] = await loadReviewContext({ figureId: p.figureId });
  // An archived panel has left its figure (no letter, no part of its state); its page still shows its trail.
  const view = review.panels.find((x) => x.panel.id === panelId) ?? (await archivedPanelView(p, rev ?? null));
  const decided = await Promise.all(
    view.decisions.map(async (d) => {
      if (!d.stale || !rev) return { ...d, changes: [] };
      const [old] = await getDb().select().from(revisions).where(eq(revisions.id, d.revisionId));
      return { ...d, changes: await describeChanges(old, rev) };
    }),
  );
  return {
    ...p,
    manuscriptId,
    role,
    letter: p.archivedAt ? letterFor(siblings.findIndex((s) => s.id === p.id)) : view.letter,
    currentRevision: rev ? { ...rev, spec: JSON.parse(rev.spec) as unknown } : null,
    dataWarnings: rev ? await revisionWarnings(rev) : [],
    reviewState: view.state,
    approvedBy: view.approvedBy,
    needsRevisionBy: view.needsRevisionBy,
    waitingOn: view.waitingOn,
    openThreads: view.openThreads,
    inReview: p.reviewRequestedAt != null,
    figure: { id: review.figure.id, number: review.figure.number, title: review.figure.title, figureHash: review.figureHash, state: review.state },
    decisions: decided,
  };
}

/** The review view of an archived panel, read apart from its figure's: its decisions stay on record. */
async function archivedPanelView(p: typeof panels.$inferSelect, rev: typeof revisions.$inferSelect | null) {
  const rows = await getDb()
    .select({ d: decisions, name: users.name })
    .from(decisions)
    .innerJoin(users, eq(users.id, decisions.userId))
    .where(eq(decisions.panelId, p.id))
    .orderBy(asc(decisions.createdAt));
  const [{ n } = { n: 0 }] = await getDb()
    .select({ n: count() })
    .from(threads)
    .where(and(eq(threads.panelId, p.id), isNull(threads.resolvedAt)));
  const st = panelReviewState({
    currentHash: rev?.contentHash ?? null,
    requiredReviewers: [],
    signedOff: false,
    reviewRequested: p.reviewRequestedAt != null,
    decisions: rows.map(({ d }) => ({ userId: d.userId, decision: d.decision, contentHash: d.contentHash, createdAt: d.createdAt.getTime() })),
  });
  return {
    ...st,
    letter: "",
    openThreads: n,
    decisions: rows.map(({ d, name }) => ({ ...d, userName: name, stale: d.contentHash !== rev?.contentHash })),
  };
}
