import "server-only";
import { asc, eq, max } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { panels, revisions } from "@/db/schema";
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
  const view = review.panels.find((x) => x.panel.id === panelId)!;
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
    letter: letterFor(siblings.findIndex((s) => s.id === p.id)),
    currentRevision: rev ? { ...rev, spec: JSON.parse(rev.spec) as unknown } : null,
    dataWarnings: rev ? await revisionWarnings(rev) : [],
    reviewState: view.state,
    approvedBy: view.approvedBy,
    needsRevisionBy: view.needsRevisionBy,
    waitingOn: view.waitingOn,
    openThreads: view.openThreads,
    figure: { id: review.figure.id, number: review.figure.number, title: review.figure.title, figureHash: review.figureHash, state: review.state },
    decisions: decided,
  };
}
