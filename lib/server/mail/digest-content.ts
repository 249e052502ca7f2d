import "server-only";
import { and, asc, eq, gte, inArray, isNull, lt, ne } from "drizzle-orm";
import type { SQLiteColumn } from "drizzle-orm/sqlite-core";
import { getDb } from "@/db/client";
import { comments, datasets, decisions, figures, panels, revisions, signoffs, threads, users, versions, type DigestFrequency, type Role } from "@/db/schema";
import { env } from "@/lib/env";
import { commentExcerpt } from "../review/comment-body";
import { loadReviewContext } from "../review/review-context";
import { describeChanges } from "../review/what-changed";
import { Places } from "./digest-places";

interface DigestLine {
  at: number;
  text: string;
  href: string;
}
interface DigestFigure {
  number: number;
  title: string;
  href: string;
  lines: DigestLine[];
}
interface DigestManuscript {
  title: string;
  href: string;
  figures: DigestFigure[];
}
/** A busy figure shows its first lines and then one line to the figure itself, so a month away stays readable. */
const LINES_PER_FIGURE = 8;

function capped(lines: DigestLine[], label: string, href: string): DigestLine[] {
  if (lines.length <= LINES_PER_FIGURE) return lines;
  const shown = lines.slice(0, LINES_PER_FIGURE - 1);
  const rest = lines.length - shown.length;
  return [...shown, { at: lines[lines.length - 1].at, text: `…and ${rest} more on ${label}: open the figure to see them all`, href }];
}

export interface Digest {
  name: string;
  frequency: Exclude<DigestFrequency, "off">;
  timeZone: string;
  since: Date;
  until: Date;
  manuscripts: DigestManuscript[];
  /** Events in all (before a busy figure's lines are folded); 0 sends nothing. */
  count: number;
}

/**
 * What happened on the given manuscripts in [since, until) that concerns `userId`, grouped by
 * manuscript then figure: comments and decisions by others, their approvals gone stale and still
 * waiting on them, new data versions under panels they reviewed, sign-offs done, and (to a PI)
 * figures that became ready for sign-off. Their own actions and figures they unfollowed are left out.
 */
export async function buildDigest(
  user: { id: string; name: string; unfollowedFigures?: string[] },
  memberships: Array<{ manuscriptId: string; role: Role }>,
  schedule: { frequency: Exclude<DigestFrequency, "off">; timeZone: string },
  since: Date,
  until: Date,
  places = new Places(),
): Promise<Digest> {
  const db = getDb();
  const app = env().appUrl;
  const ids = memberships.map((m) => m.manuscriptId);
  const byManuscript = new Map<string, Map<string, DigestLine[]>>();
  const unfollowed = new Set(user.unfollowedFigures);
  const add = (manuscriptId: string, figureId: string, line: DigestLine) => {
    if (unfollowed.has(figureId)) return;
    const figs = byManuscript.get(manuscriptId) ?? new Map<string, DigestLine[]>();
    byManuscript.set(manuscriptId, figs);
    figs.set(figureId, [...(figs.get(figureId) ?? []), line]);
  };
  const inWindow = (col: SQLiteColumn) => and(gte(col, since), lt(col, until));
  const panelPlace = async (manuscriptId: string, panelId: string) => (await places.get(manuscriptId)).panels.get(panelId);

  if (ids.length) {
    const newComments = await db
      .select({
        id: comments.id,
        html: comments.html,
        at: comments.createdAt,
        threadId: threads.id,
        panelId: threads.panelId,
        manuscriptId: figures.manuscriptId,
        by: users.name,
      })
      .from(comments)
      .innerJoin(threads, eq(threads.id, comments.threadId))
      .innerJoin(panels, eq(panels.id, threads.panelId))
      .innerJoin(figures, eq(figures.id, panels.figureId))
      .innerJoin(users, eq(users.id, comments.createdBy))
      .where(and(inArray(figures.manuscriptId, ids), inWindow(comments.createdAt), isNull(comments.deletedAt), ne(comments.createdBy, user.id)));
    for (const c of newComments) {
      const p = await panelPlace(c.manuscriptId, c.panelId);
      if (!p) continue;
      add(c.manuscriptId, p.figureId, {
        at: c.at.getTime(),
        text: `${c.by} commented on ${p.label}: “${commentExcerpt(c.html, 160)}”`,
        href: `${app}/panels/${c.panelId}#thread-${c.threadId}`,
      });
    }

    const newDecisions = await db
      .select({ d: decisions, number: revisions.number, manuscriptId: figures.manuscriptId, by: users.name })
      .from(decisions)
      .innerJoin(revisions, eq(revisions.id, decisions.revisionId))
      .innerJoin(panels, eq(panels.id, decisions.panelId))
      .innerJoin(figures, eq(figures.id, panels.figureId))
      .innerJoin(users, eq(users.id, decisions.userId))
      .where(and(inArray(figures.manuscriptId, ids), inWindow(decisions.createdAt), ne(decisions.userId, user.id)));
    for (const { d, number, manuscriptId, by } of newDecisions) {
      const p = await panelPlace(manuscriptId, d.panelId);
      if (!p) continue;
      const note = d.note ? `: “${d.note}”` : "";
      add(manuscriptId, p.figureId, {
        at: d.createdAt.getTime(),
        text:
          d.decision === "approved"
            ? `${by} approved ${p.label} (revision ${number})${note}`
            : `${by} asked for a revision of ${p.label} (revision ${number})${note}`,
        href: `${app}/panels/${d.panelId}`,
      });
    }

    // The person's own decisions: approvals gone stale, and the panels whose data they reviewed.
    const mine = await db
      .select({ d: decisions, manuscriptId: figures.manuscriptId })
      .from(decisions)
      .innerJoin(panels, eq(panels.id, decisions.panelId))
      .innerJoin(figures, eq(figures.id, panels.figureId))
      .where(and(inArray(figures.manuscriptId, ids), eq(decisions.userId, user.id)))
      .orderBy(asc(decisions.createdAt));
    const latestMine = new Map(mine.map((x) => [x.d.panelId, x]));
    const reviewedPanels = [...latestMine.values()];
    const currentIds = (await Promise.all(reviewedPanels.map(async (x) => (await panelPlace(x.manuscriptId, x.d.panelId))?.currentRevisionId ?? null))).filter(
      (x): x is string => Boolean(x),
    );
    const current = currentIds.length ? await db.select().from(revisions).where(inArray(revisions.id, currentIds)) : [];
    const currentOf = new Map(current.map((r) => [r.panelId, r]));

    const staleOnes = reviewedPanels.filter(({ d }) => {
      const r = currentOf.get(d.panelId);
      return d.decision === "approved" && r && r.contentHash !== d.contentHash && r.createdAt >= since && r.createdAt < until;
    });
    if (staleOnes.length) {
      const approvedRevs = await db
        .select()
        .from(revisions)
        .where(
          inArray(
            revisions.id,
            staleOnes.map((x) => x.d.revisionId),
          ),
        );
      const names = new Map(
        (
          await db
            .select({ id: users.id, name: users.name })
            .from(users)
            .where(
              inArray(
                users.id,
                staleOnes.map((x) => currentOf.get(x.d.panelId)!.createdBy),
              ),
            )
        ).map((u) => [u.id, u.name]),
      );
      for (const { d, manuscriptId } of staleOnes) {
        const p = await panelPlace(manuscriptId, d.panelId);
        const now = currentOf.get(d.panelId)!;
        const then = approvedRevs.find((r) => r.id === d.revisionId);
        if (!p || !then) continue;
        const changes = await describeChanges(then, now);
        add(manuscriptId, p.figureId, {
          at: now.createdAt.getTime(),
          text: `Your approval of ${p.label} went stale: ${names.get(now.createdBy) ?? "someone"} saved revision ${now.number} (${changes.length ? changes.map((c) => c.text).join("; ") : "the content changed"}); it waits for your review`,
          href: `${app}/panels/${d.panelId}`,
        });
      }
    }

    // New versions of the datasets bound in the current revisions of panels they reviewed.
    const boundVersionIds = [...new Set(current.flatMap((r) => Object.values(r.bound).map((b) => b.versionId)))];
    const bound = boundVersionIds.length
      ? await db.select({ id: versions.id, datasetId: versions.datasetId, number: versions.number }).from(versions).where(inArray(versions.id, boundVersionIds))
      : [];
    const datasetIds = [...new Set(bound.map((b) => b.datasetId))];
    const fresh = datasetIds.length
      ? await db
          .select({ v: versions, dataset: datasets.name, manuscriptId: datasets.manuscriptId, by: users.name })
          .from(versions)
          .innerJoin(datasets, eq(datasets.id, versions.datasetId))
          .innerJoin(users, eq(users.id, versions.createdBy))
          .where(
            and(inArray(versions.datasetId, datasetIds), inWindow(versions.createdAt), ne(versions.createdBy, user.id), isNull(versions.derivedFromAnalysisId)),
          )
      : [];
    for (const { v, dataset, manuscriptId, by } of fresh) {
      const uses = new Map<string, string[]>();
      for (const r of current) {
        const used = Object.values(r.bound)
          .map((b) => bound.find((x) => x.id === b.versionId))
          .find((x) => x?.datasetId === v.datasetId && x.number < v.number);
        const p = used ? await panelPlace(manuscriptId, r.panelId) : undefined;
        if (p && used) uses.set(p.figureId, [...(uses.get(p.figureId) ?? []), `${p.label} uses version ${used.number}`]);
      }
      for (const [figureId, what] of uses)
        add(manuscriptId, figureId, {
          at: v.createdAt.getTime(),
          text: `${by} uploaded version ${v.number} of “${dataset}” (${v.fileName}); ${what.join(", ")}`,
          href: `${app}/datasets/${v.datasetId}`,
        });
    }

    const newSignoffs = await db
      .select({ s: signoffs, manuscriptId: figures.manuscriptId, number: figures.number, by: users.name })
      .from(signoffs)
      .innerJoin(figures, eq(figures.id, signoffs.figureId))
      .innerJoin(users, eq(users.id, signoffs.userId))
      .where(and(inArray(figures.manuscriptId, ids), inWindow(signoffs.createdAt), ne(signoffs.userId, user.id), isNull(signoffs.withdrawnAt)));
    for (const { s, manuscriptId, number, by } of newSignoffs)
      add(manuscriptId, s.figureId, {
        at: s.createdAt.getTime(),
        text: `${by} signed off Figure ${number}${s.reason ? ` (reason given for open issues: “${s.reason}”)` : ""}`,
        href: `${app}/figures/${s.figureId}`,
      });

    // To a PI: figures whose last needed approval came in this window and that still wait for sign-off.
    for (const m of memberships.filter((x) => x.role === "pi")) {
      for (const f of await loadReviewContext({ manuscriptId: m.manuscriptId })) {
        if (f.state !== "approved") continue;
        const last = f.panels
          .flatMap((p) => p.decisions.filter((d) => d.decision === "approved" && !d.stale))
          .sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime())
          .at(-1);
        if (!last || last.createdAt < since || last.createdAt >= until) continue;
        add(m.manuscriptId, f.figure.id, {
          at: last.createdAt.getTime(),
          text: `Figure ${f.figure.number} is ready for your sign-off: every panel is approved`,
          href: `${app}/figures/${f.figure.id}`,
        });
      }
    }
  }

  const out: DigestManuscript[] = [];
  for (const [manuscriptId, figs] of byManuscript) {
    const place = await places.get(manuscriptId);
    out.push({
      title: place.title,
      href: `${app}/manuscripts/${manuscriptId}`,
      figures: [...figs]
        .map(([figureId, lines]) => ({
          number: place.figures.get(figureId)?.number ?? 0,
          title: place.figures.get(figureId)?.title ?? "",
          href: `${app}/figures/${figureId}`,
          lines: capped(
            lines.sort((a, b) => a.at - b.at), // stable: at one moment, the event before what it caused
            `Figure ${place.figures.get(figureId)?.number ?? 0}`,
            `${app}/figures/${figureId}`,
          ),
        }))
        .sort((a, b) => a.number - b.number),
    });
  }
  out.sort((a, b) => a.title.localeCompare(b.title));
  return {
    name: user.name,
    frequency: schedule.frequency,
    timeZone: schedule.timeZone,
    since,
    until,
    manuscripts: out,
    count: [...byManuscript.values()].reduce((n, figs) => n + [...figs.values()].reduce((k, lines) => k + lines.length, 0), 0),
  };
}
