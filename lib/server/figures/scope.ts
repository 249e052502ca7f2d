import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { figures, panels, revisions } from "@/db/schema";
import { notFound } from "@/lib/errors";
import { onceInRequest } from "../request-memo";

export function manuscriptOfFigure(figureId: string): Promise<string> {
  return onceInRequest(`manuscriptOfFigure:${figureId}`, async () => {
    const [f] = await getDb().select({ m: figures.manuscriptId }).from(figures).where(eq(figures.id, figureId));
    if (!f) throw notFound();
    return f.m;
  });
}

export function manuscriptOfPanel(panelId: string): Promise<string> {
  return onceInRequest(`manuscriptOfPanel:${panelId}`, async () => {
    const [p] = await getDb()
      .select({ m: figures.manuscriptId })
      .from(panels)
      .innerJoin(figures, eq(figures.id, panels.figureId))
      .where(eq(panels.id, panelId));
    if (!p) throw notFound();
    return p.m;
  });
}

export function manuscriptOfRevision(revisionId: string): Promise<string> {
  return onceInRequest(`manuscriptOfRevision:${revisionId}`, async () => {
    const [r] = await getDb()
      .select({ m: figures.manuscriptId })
      .from(revisions)
      .innerJoin(panels, eq(panels.id, revisions.panelId))
      .innerJoin(figures, eq(figures.id, panels.figureId))
      .where(eq(revisions.id, revisionId));
    if (!r) throw notFound();
    return r.m;
  });
}

/** Panel letters follow the order: a, b, …, z, aa, ab … */
export function letterFor(index: number): string {
  let n = index;
  let s = "";
  do {
    s = String.fromCharCode(97 + (n % 26)) + s;
    n = Math.floor(n / 26) - 1;
  } while (n >= 0);
  return s;
}
