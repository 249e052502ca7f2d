import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { analyses, auditLog, datasets, revisions, users, versions } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { notFound } from "@/lib/errors";
import { sha256Hex } from "../crypto";
import { loadReviewContext } from "../review/review-context";
import { figureContentHash } from "./figure-hash";
import { getFigure } from "./figures";
import { getRevision } from "./revisions";
import { manuscriptOfFigure } from "./scope";

/** `?format=json` (default): the trace as Prooflight describes it; `prov`: the same chain as W3C PROV-JSON. */
export const traceQuery = z.object({
  format: z.enum(["json", "prov"], { message: "format must be json or prov" }).default("json"),
});

export interface TraceOptions {
  /** The figure's past exports from the audit log; the bundle leaves them out so that the same figure gives the same bytes. */
  exports?: boolean;
}

/**
 * Raw file → analysis → revision → figure, with every hash: what a referee's "which file made panel 3c?" needs;
 * then who reviewed which revision, the sign-offs (withdrawn ones too) and the files exported so far.
 */
export async function traceFigure(user: SessionUser, figureId: string, options: TraceOptions = {}) {
  await authorize(user, "manuscript.read", await manuscriptOfFigure(figureId));
  const fig = await getFigure(user, figureId);
  const people = new PeopleNames();
  const panelsOut = [];
  for (const p of fig.panels) {
    if (!p.currentRevision) {
      panelsOut.push({ letter: p.letter, panelId: p.id, title: p.title, revision: null, inputs: [] });
      continue;
    }
    const rev = await getRevision(user, p.currentRevision.id);
    const inputs = [];
    for (const [name, b] of Object.entries(rev.bound)) {
      const version = await describeVersion(b.versionId, people);
      if (b.kind === "version") {
        inputs.push({ name, kind: "version" as const, version });
        continue;
      }
      const [a] = await getDb().select().from(analyses).where(eq(analyses.id, b.id));
      inputs.push({
        name,
        kind: "analysis" as const,
        output: b.output,
        analysis: {
          id: a.id,
          model: a.model,
          modelVersion: a.modelVersion,
          options: a.options,
          inputSha256: a.inputSha256,
          createdAt: a.createdAt,
          createdBy: await people.person(a.createdBy),
        },
        input: await describeVersion(a.versionId, people),
        derived: version,
      });
    }
    panelsOut.push({
      letter: p.letter,
      panelId: p.id,
      title: p.title,
      revision: {
        id: rev.id,
        number: rev.number,
        contentHash: rev.contentHash,
        specSha256: sha256Hex(canonicalJson(rev.spec)),
        message: rev.message,
        createdAt: rev.createdAt,
        createdBy: rev.createdBy,
        createdByName: (await people.person(rev.createdBy)).name,
      },
      inputs,
    });
  }
  const figureHash = figureContentHash(
    fig,
    fig.panels.map((p) => ({ letter: p.letter, colSpan: p.colSpan, contentHash: p.currentRevision?.contentHash ?? null })),
  );
  return {
    figure: { id: fig.id, number: fig.number, title: fig.title, widthMm: fig.widthMm, figureHash },
    panels: panelsOut,
    ...(await reviewTrail(figureId, people)),
    exports: options.exports === false ? [] : await exportTrail(figureId, people),
  };
}

export type FigureTrace = Awaited<ReturnType<typeof traceFigure>>;

/** Every decision on the figure's panels (on any of their revisions, oldest first) and every sign-off. */
async function reviewTrail(figureId: string, people: PeopleNames) {
  const [review] = await loadReviewContext({ figureId });
  if (!review) throw notFound();
  const decided = review.panels.flatMap((p) => p.decisions.map((d) => ({ d, letter: p.letter })));
  const revIds = [...new Set(decided.map(({ d }) => d.revisionId))];
  const numbers = new Map(
    (revIds.length ? await getDb().select({ id: revisions.id, n: revisions.number }).from(revisions).where(inArray(revisions.id, revIds)) : []).map((r) => [
      r.id,
      r.n,
    ]),
  );
  const decisions = decided
    .map(({ d, letter }) => ({
      id: d.id,
      panelLetter: letter,
      revisionId: d.revisionId,
      revisionNumber: numbers.get(d.revisionId) ?? null,
      contentHash: d.contentHash,
      decision: d.decision,
      note: d.note,
      by: { id: d.userId, name: d.userName },
      createdAt: d.createdAt,
      stale: d.stale,
    }))
    .sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime() || a.id.localeCompare(b.id));
  const signedOver = await printCheckSignedOver(figureId);
  const signoffs = [];
  for (const s of [...review.signoffs].sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime() || a.id.localeCompare(b.id))) {
    signoffs.push({
      id: s.id,
      figureHash: s.figureHash,
      reason: s.reason,
      /** Print-check failures the PI signed over with this reason (from the sign-off's audit entry). */
      printCheck: signedOver.get(s.id) ?? [],
      by: await people.person(s.userId),
      createdAt: s.createdAt,
      stale: s.stale,
      withdrawn: s.withdrawnAt ? { at: s.withdrawnAt, by: await people.person(s.withdrawnBy ?? ""), reason: s.withdrawReason ?? "" } : null,
    });
  }
  return { decisions, signoffs };
}

/** The print-check failures each sign-off was recorded over, by sign-off id, from the audit log. */
async function printCheckSignedOver(figureId: string): Promise<Map<string, string[]>> {
  const rows = await getDb()
    .select({ data: auditLog.data })
    .from(auditLog)
    .where(and(eq(auditLog.action, "figure.signoff"), eq(auditLog.target, `figure:${figureId}`)));
  const out = new Map<string, string[]>();
  for (const r of rows) {
    const d = JSON.parse(String(r.data)) as { signoffId?: string; printCheck?: string[] };
    if (d.signoffId && Array.isArray(d.printCheck)) out.set(d.signoffId, d.printCheck);
  }
  return out;
}

/** The files exported from the figure, as the audit log recorded them (format, figure hash, size, who, when). */
async function exportTrail(figureId: string, people: PeopleNames) {
  const rows = await getDb()
    .select()
    .from(auditLog)
    .where(and(eq(auditLog.action, "figure.export"), eq(auditLog.target, `figure:${figureId}`)))
    .orderBy(asc(auditLog.seq));
  const out = [];
  for (const r of rows) {
    const d = JSON.parse(String(r.data)) as {
      format: string;
      figureHash: string;
      bytes: number;
      signedOff: boolean;
      draftMark: boolean;
      dpi?: number;
      colour?: string;
    };
    out.push({
      seq: r.seq,
      at: r.at,
      by: await people.person(r.actorId ?? ""),
      format: d.format,
      ...(d.dpi ? { dpi: d.dpi } : {}),
      ...(d.colour ? { colour: d.colour } : {}),
      figureHash: d.figureHash,
      bytes: d.bytes,
      signedOff: d.signedOff,
      draftMark: d.draftMark,
    });
  }
  return out;
}

/** Names of the people in a trace, looked up once each; someone no longer on record is named by id. */
class PeopleNames {
  private readonly known = new Map<string, string>();
  async person(id: string): Promise<{ id: string; name: string }> {
    if (!this.known.has(id)) {
      const [u] = id ? await getDb().select({ name: users.name }).from(users).where(eq(users.id, id)) : [];
      this.known.set(id, u?.name ?? (id || "unknown"));
    }
    return { id, name: this.known.get(id)! };
  }
}

async function describeVersion(versionId: string, people: PeopleNames) {
  const [row] = await getDb()
    .select({ v: versions, d: datasets })
    .from(versions)
    .innerJoin(datasets, eq(datasets.id, versions.datasetId))
    .where(eq(versions.id, versionId));
  const newest = await getDb().select({ n: versions.number }).from(versions).where(eq(versions.datasetId, row.d.id));
  return {
    versionId,
    datasetId: row.d.id,
    dataset: row.d.name,
    /** The dataset's measurement kind and sample, so an imported bundle recreates them. */
    datasetKind: row.d.kind,
    sample: row.d.sample,
    number: row.v.number,
    latestNumber: Math.max(...newest.map((x) => x.n)),
    sha256: row.v.sha256,
    fileName: row.v.fileName,
    byteSize: row.v.byteSize,
    format: row.v.parseInfo.format,
    derivedFromAnalysisId: row.v.derivedFromAnalysisId,
    createdAt: row.v.createdAt,
    createdBy: await people.person(row.v.createdBy),
  };
}
