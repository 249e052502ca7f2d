import "server-only";
import { eq, sql } from "drizzle-orm";
import { preparedQuery } from "@/db/prepared";
import { figures, panels, revisions } from "@/db/schema";
import { manuscriptOnceInRequest } from "@/lib/request-memo";

const id = sql.placeholder("id");
const ofFigure = preparedQuery((db) => db.select({ m: figures.manuscriptId }).from(figures).where(eq(figures.id, id)).prepare());
const ofPanel = preparedQuery((db) =>
  db.select({ m: figures.manuscriptId }).from(panels).innerJoin(figures, eq(figures.id, panels.figureId)).where(eq(panels.id, id)).prepare(),
);
const ofRevision = preparedQuery((db) =>
  db
    .select({ m: figures.manuscriptId })
    .from(revisions)
    .innerJoin(panels, eq(panels.id, revisions.panelId))
    .innerJoin(figures, eq(figures.id, panels.figureId))
    .where(eq(revisions.id, id))
    .prepare(),
);

export function manuscriptOfFigure(figureId: string): Promise<string> {
  return manuscriptOnceInRequest("figure", figureId, () => ofFigure().all({ id: figureId }));
}

export function manuscriptOfPanel(panelId: string): Promise<string> {
  return manuscriptOnceInRequest("panel", panelId, () => ofPanel().all({ id: panelId }));
}

export function manuscriptOfRevision(revisionId: string): Promise<string> {
  return manuscriptOnceInRequest("revision", revisionId, () => ofRevision().all({ id: revisionId }));
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
