import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, datasets, versions } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { sha256Hex } from "../crypto";
import { figureContentHash } from "./figure-hash";
import { getFigure } from "./figures";
import { getRevision } from "./revisions";
import { manuscriptOfFigure } from "./scope";

/**
 * Raw file → analysis → revision → figure, with every hash: what a referee's "which file made panel 3c?" needs.
 */
export async function traceFigure(user: SessionUser, figureId: string) {
  await authorize(user, "manuscript.read", await manuscriptOfFigure(figureId));
  const fig = await getFigure(user, figureId);
  const panelsOut = [];
  for (const p of fig.panels) {
    if (!p.currentRevision) {
      panelsOut.push({ letter: p.letter, panelId: p.id, title: p.title, revision: null, inputs: [] });
      continue;
    }
    const rev = await getRevision(user, p.currentRevision.id);
    const inputs = [];
    for (const [name, b] of Object.entries(rev.bound)) {
      const version = await describeVersion(b.versionId);
      if (b.kind === "version") {
        inputs.push({ name, kind: "version" as const, version });
        continue;
      }
      const [a] = await getDb().select().from(analyses).where(eq(analyses.id, b.id));
      inputs.push({
        name,
        kind: "analysis" as const,
        output: b.output,
        analysis: { id: a.id, model: a.model, modelVersion: a.modelVersion, options: a.options, inputSha256: a.inputSha256, createdAt: a.createdAt },
        input: await describeVersion(a.versionId),
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
      },
      inputs,
    });
  }
  const figureHash = figureContentHash(
    fig,
    fig.panels.map((p) => ({ letter: p.letter, colSpan: p.colSpan, contentHash: p.currentRevision?.contentHash ?? null })),
  );
  return { figure: { id: fig.id, number: fig.number, title: fig.title, widthMm: fig.widthMm, figureHash }, panels: panelsOut };
}

async function describeVersion(versionId: string) {
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
    number: row.v.number,
    latestNumber: Math.max(...newest.map((x) => x.n)),
    sha256: row.v.sha256,
    fileName: row.v.fileName,
    byteSize: row.v.byteSize,
    createdAt: row.v.createdAt,
  };
}
