import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { comments, manuscripts, threads } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";
import { membershipsForUser } from "../manuscripts";
import { loadReviewContext } from "./review-context";

export interface QueueItem {
  kind: "review" | "mention" | "signoff" | "revise";
  manuscriptId: string;
  manuscriptTitle: string;
  figureId: string;
  figureNumber: number;
  figureTitle: string;
  panelId?: string;
  letter?: string;
  state: string;
  since: string;
  what: string;
}

/** "Waiting on me" across every manuscript the caller belongs to. */
export async function waitingOnMe(user: SessionUser): Promise<QueueItem[]> {
  const memberships = await membershipsForUser(user.id);
  const items: QueueItem[] = [];
  for (const m of memberships) {
    const [ms] = await getDb().select({ title: manuscripts.title }).from(manuscripts).where(eq(manuscripts.id, m.manuscriptId));
    for (const f of await loadReviewContext({ manuscriptId: m.manuscriptId })) {
      const base = {
        manuscriptId: m.manuscriptId,
        manuscriptTitle: ms.title,
        figureId: f.figure.id,
        figureNumber: f.figure.number,
        figureTitle: f.figure.title,
      };
      const required = f.figure.requiredReviewers;
      for (const p of f.panels) {
        // A draft asks nobody until its author sends it to review.
        if (!p.revision || f.state === "signed_off" || p.state === "draft") continue;
        const at = { ...base, panelId: p.panel.id, letter: p.letter, state: p.state, since: p.revision.createdAt.toISOString() };
        const mine = p.revision.createdBy === user.id;
        const expected = required.length ? required.includes(user.id) : m.role === "reviewer";
        const decided = p.approvedBy.includes(user.id) || p.needsRevisionBy.includes(user.id);
        if (!mine && expected && !decided && m.role !== "viewer")
          items.push({ kind: "review", ...at, what: `review panel ${p.letter} (revision ${p.revision.number})` });
        if (mine && p.state === "needs_revision") items.push({ kind: "revise", ...at, what: `panel ${p.letter} needs revision` });
      }
      if (m.role === "pi" && f.state === "approved")
        items.push({ kind: "signoff", ...base, state: f.state, since: new Date().toISOString(), what: `sign off figure ${f.figure.number}` });
    }
  }
  const mentioned = await getDb()
    .select({ c: comments, t: threads })
    .from(comments)
    .innerJoin(threads, eq(threads.id, comments.threadId))
    .where(and(isNull(threads.resolvedAt), isNull(comments.deletedAt)));
  const byThread = new Map<string, { mentionAt: Date; repliedAt: Date | null; panelId: string }>();
  for (const { c, t } of mentioned) {
    const e = byThread.get(t.id) ?? { mentionAt: new Date(0), repliedAt: null, panelId: t.panelId };
    if (c.mentions.includes(user.id) && c.createdAt > e.mentionAt) e.mentionAt = c.createdAt;
    if (c.createdBy === user.id && (!e.repliedAt || c.createdAt > e.repliedAt)) e.repliedAt = c.createdAt;
    byThread.set(t.id, e);
  }
  const waiting = [...byThread.entries()].filter(([, e]) => e.mentionAt.getTime() > 0 && (!e.repliedAt || e.repliedAt < e.mentionAt));
  if (waiting.length) {
    const manuscriptIds = memberships.map((m) => m.manuscriptId);
    for (const ctx of manuscriptIds.length ? await Promise.all(manuscriptIds.map((id) => loadReviewContext({ manuscriptId: id }))) : []) {
      for (const f of ctx)
        for (const p of f.panels)
          for (const [, e] of waiting.filter(([, e]) => e.panelId === p.panel.id)) {
            const [ms] = await getDb().select({ title: manuscripts.title }).from(manuscripts).where(eq(manuscripts.id, f.figure.manuscriptId));
            items.push({
              kind: "mention",
              manuscriptId: f.figure.manuscriptId,
              manuscriptTitle: ms.title,
              figureId: f.figure.id,
              figureNumber: f.figure.number,
              figureTitle: f.figure.title,
              panelId: p.panel.id,
              letter: p.letter,
              state: p.state,
              since: e.mentionAt.toISOString(),
              what: `you were mentioned on panel ${p.letter}`,
            });
          }
    }
  }
  return items.sort((a, b) => a.since.localeCompare(b.since));
}
