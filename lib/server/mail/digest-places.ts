import "server-only";
import { asc, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { figures, manuscripts, panels } from "@/db/schema";
import { letterFor } from "../figures/scope";

interface Place {
  title: string;
  figures: Map<string, { number: number; title: string }>;
  panels: Map<string, { figureId: string; label: string; currentRevisionId: string | null }>;
}

/** Manuscript, figure and panel names for one run, read once per manuscript however many people follow it. */
export class Places {
  private cache = new Map<string, Promise<Place>>();
  get(manuscriptId: string): Promise<Place> {
    let p = this.cache.get(manuscriptId);
    if (!p) {
      p = this.load(manuscriptId);
      this.cache.set(manuscriptId, p);
    }
    return p;
  }
  private async load(manuscriptId: string): Promise<Place> {
    const db = getDb();
    const [m] = await db.select({ title: manuscripts.title }).from(manuscripts).where(eq(manuscripts.id, manuscriptId));
    const figs = await db.select().from(figures).where(eq(figures.manuscriptId, manuscriptId));
    const ps = figs.length
      ? await db
          .select()
          .from(panels)
          .where(
            inArray(
              panels.figureId,
              figs.map((f) => f.id),
            ),
          )
          .orderBy(asc(panels.position))
      : [];
    const place: Place = { title: m?.title ?? "", figures: new Map(), panels: new Map() };
    for (const f of figs) {
      place.figures.set(f.id, { number: f.number, title: f.title });
      ps.filter((p) => p.figureId === f.id).forEach((p, i) =>
        place.panels.set(p.id, { figureId: f.id, label: `Figure ${f.number}${letterFor(i)}`, currentRevisionId: p.currentRevisionId }),
      );
    }
    return place;
  }
}
