import "server-only";
import { eq, sql } from "drizzle-orm";
import { z } from "zod";
import { getDb, type Transaction } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { decisions, manuscripts, panels, revisions, signoffs } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { appendAudit } from "../audit";
import { newId } from "../crypto";
import { badRequest, conflict, forbidden, notFound } from "@/lib/errors";
import { manuscriptOfFigure, manuscriptOfPanel } from "../figures/scope";
import { deriveReviews, loadReviewContext, loadReviewRows } from "./review-context";
import { decisionInput, signoffInput } from "./schemas";
import { amendOverview, keptFigureRows } from "./overview-snapshot";
import { noticeDecision, noticeSignoff } from "./review-notices";
import { openIssuesOf } from "./review-edges";
import { printCheckOf } from "../figures/print-check";
import { printCheckFailures } from "@/lib/figures/print-check";

const id = sql.placeholder("id");
const panelById = preparedQuery((db) => db.select().from(panels).where(eq(panels.id, id)).prepare());
const revisionById = preparedQuery((db) => db.select().from(revisions).where(eq(revisions.id, id)).prepare());
const decisionInsert = preparedQuery((db) =>
  db
    .insert(decisions)
    .values({
      id,
      panelId: sql.placeholder("panelId"),
      revisionId: sql.placeholder("revisionId"),
      contentHash: sql.placeholder("contentHash"),
      decision: sql.placeholder("decision"),
      note: sql.placeholder("note"),
      userId: sql.placeholder("userId"),
    })
    .returning()
    .prepare(),
);
const stampById = preparedQuery((db) => db.select({ s: manuscripts.reviewStamp }).from(manuscripts).where(eq(manuscripts.id, id)).prepare());

/**
 * A review decision on a revision's content hash. Reviewers, the PI and authors other than the
 * revision's creator decide; nobody approves their own revision; only the current revision counts.
 */
export async function recordDecision(user: SessionUser, panelId: string, raw: z.infer<typeof decisionInput>) {
  const manuscriptId = await manuscriptOfPanel(panelId);
  await authorize(user, "review.decide", manuscriptId);
  const input = decisionInput.parse(raw);
  const id = newId();
  const stampOf = async (tx: Transaction) => (await stampById(tx).get({ id: manuscriptId }))!.s;
  const amend = await getDb().transaction(async (tx) => {
    const p = (await panelById(tx).get({ id: panelId }))!;
    const rev = await revisionById(tx).get({ id: input.revisionId });
    if (!rev || rev.panelId !== panelId) throw badRequest("revisionId: not a revision of this panel.");
    if (p.currentRevisionId !== rev.id)
      throw conflict(`Revision ${rev.number} is no longer current; review the current revision instead.`, { currentRevisionId: p.currentRevisionId });
    if (rev.createdBy === user.id) throw forbidden("You made this revision; someone else must review it.");
    if (p.archivedAt) throw conflict("This panel is archived; restore it before deciding on it.");
    if (!p.reviewRequestedAt)
      throw conflict("This panel is a draft: comment on it freely, but approvals and requests for a revision wait until its author sends it to review.");
    const from = await stampOf(tx);
    const rows = keptFigureRows(manuscriptId, from, p.figureId) ?? (await loadReviewRows({ figureId: p.figureId }, tx, "latest-on-current"));
    const made = await decisionInsert(tx).get({
      id,
      panelId,
      revisionId: rev.id,
      contentHash: rev.contentHash,
      decision: input.decision,
      note: input.note ?? "",
      userId: user.id,
    });
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId,
      action: `review.${input.decision}`,
      target: `panel:${panelId}`,
      data: { revisionId: rev.id, contentHash: rev.contentHash, note: input.note ?? "", ...(input.acknowledgedWarnings ? { acknowledgedWarnings: true } : {}) },
    });
    // The state after is derived from the rows already read plus this decision, which replaces the
    // person's earlier one on this content (it is the latest; the rows hold only latest ones).
    const [before] = deriveReviews(rows);
    const others = rows.decs.filter(({ d }) => !(d.panelId === panelId && d.userId === user.id && d.contentHash === rev.contentHash));
    const afterRows = { ...rows, decs: [...others, { d: made, name: user.name }] };
    const [after] = deriveReviews(afterRows);
    await noticeDecision(tx, user, rev, input.decision, input.note ?? "", { before, after });
    return { from, to: await stampOf(tx), after, afterRows };
  });
  // The kept overview takes the new state of this one figure instead of being read again.
  if (amend.after) amendOverview(manuscriptId, amend.from, amend.to, amend.after, amend.afterRows);
  return { id, panelId, revisionId: input.revisionId, decision: input.decision };
}

/**
 * PI sign-off of the figure's current hash; with open issues or print-check failures only with a recorded
 * reason, and the failures signed over go into the audit entry (and so the trace) beside it.
 */
export async function signOffFigure(user: SessionUser, figureId: string, raw: z.infer<typeof signoffInput>) {
  const manuscriptId = await manuscriptOfFigure(figureId);
  await authorize(user, "figure.signoff", manuscriptId);
  const input = signoffInput.parse(raw);
  const [review] = await loadReviewContext({ figureId });
  if (!review) throw notFound();
  if (review.figureHash !== input.figureHash)
    throw conflict("The figure changed since you looked at it; review the current figure and sign off its new hash.", { figureHash: review.figureHash });
  if (!review.panels.length || review.panels.some((p) => !p.revision)) throw badRequest("Every panel needs a revision before the figure can be signed off.");
  const { lines: open, issues } = await openIssuesOf(review);
  const printCheck = printCheckFailures(await printCheckOf(review));
  if ((open.length || printCheck.length) && !input.reason) {
    const what = [open.length ? `open issues (${open.join("; ")})` : null, printCheck.length ? `print check failures (${printCheck.join("; ")})` : null];
    throw badRequest(`reason: ${what.filter(Boolean).join("; ")}; signing off anyway needs a recorded reason.`, { open, issues, printCheck });
  }
  const id = newId();
  await getDb().transaction(async (tx) => {
    await tx.insert(signoffs).values({ id, figureId, figureHash: input.figureHash, reason: input.reason ?? "", userId: user.id });
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId,
      action: "figure.signoff",
      target: `figure:${figureId}`,
      data: { signoffId: id, figureHash: input.figureHash, reason: input.reason ?? "", open, printCheck },
    });
    await noticeSignoff(tx, user, figureId, input.reason ?? "");
  });
  return { id, figureId, figureHash: input.figureHash, openIssues: open, printCheck };
}
