import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { figures, panels, revisions } from "@/db/schema";
import { manuscriptOnceInRequest } from "../request-memo";

export function manuscriptOfFigure(figureId: string): Promise<string> {
  return manuscriptOnceInRequest("figure", figureId, () => getDb().select({ m: figures.manuscriptId }).from(figures).where(eq(figures.id, figureId)));
}

export function manuscriptOfPanel(panelId: string): Promise<string> {
  return manuscriptOnceInRequest("panel", panelId, () =>
    getDb().select({ m: figures.manuscriptId }).from(panels).innerJoin(figures, eq(figures.id, panels.figureId)).where(eq(panels.id, panelId)),
  );
}

export function manuscriptOfRevision(revisionId: string): Promise<string> {
  return manuscriptOnceInRequest("revision", revisionId, () =>
    getDb()
      .select({ m: figures.manuscriptId })
      .from(revisions)
      .innerJoin(panels, eq(panels.id, revisions.panelId))
      .innerJoin(figures, eq(figures.id, panels.figureId))
      .where(eq(revisions.id, revisionId)),
  );
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
