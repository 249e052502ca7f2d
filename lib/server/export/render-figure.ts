import "server-only";
import { getDb } from "@/db/client";
import { revisions } from "@/db/schema";
import { inArray } from "drizzle-orm";
import { RenderError, renderFigureInWorker } from "../render/render-in-worker";
import { badRequest, unprocessable } from "@/lib/errors";
import { loadBoundData } from "../figures/bindings";
import { reduceRowsForDisplay } from "../figures/display-data";
import type { FigureReview } from "../review/review-context";
import { applyHouseStyle, describeHouseStyle, panelLetter, type HouseStyle } from "@/lib/figures/house-style";
import { houseStyleOf } from "../house-style";

/** Past this the vector file becomes unwieldy for journals; long series are then reduced and the export says so. */
const VECTOR_CAP_BYTES = 20 * 1024 * 1024;

export interface FigureRender {
  svg: string;
  widthMm: number;
  heightMm: number;
  notes: string[];
  /** The manuscript's house style the figure was drawn in, in words. */
  houseStyle: string;
}

/** Grid and panel letters as the house style sets them. */
function layoutFor(review: FigureReview, style: HouseStyle) {
  return { columns: review.figure.columns, letterFont: style.font, letterPt: style.letterPt, letterWeight: style.letterWeight };
}

/** The whole figure as one composed SVG at print size in the manuscript's house style, rendered in the budgeted worker with the full data. */
export async function renderFigureSvg(review: FigureReview): Promise<FigureRender> {
  const style = await houseStyleOf(review.figure.manuscriptId);
  const missing = review.panels.filter((p) => !p.revision).map((p) => p.letter);
  if (!review.panels.length) throw badRequest("The figure has no panels yet.");
  if (missing.length) throw badRequest(`Panels ${missing.join(", ")} have no revision yet; save a spec for each panel before exporting.`);
  const revs = await getDb()
    .select()
    .from(revisions)
    .where(
      inArray(
        revisions.id,
        review.panels.map((p) => p.revision!.id),
      ),
    );
  const jobs = await Promise.all(
    review.panels.map(async (p) => {
      const rev = revs.find((r) => r.id === p.revision!.id)!;
      const spec = applyHouseStyle(JSON.parse(rev.spec) as unknown, style);
      return { letter: panelLetter(p.letter, style), spec, data: await loadBoundData(rev.bound), span: p.panel.colSpan };
    }),
  );
  const layout = layoutFor(review, style);
  const notes: string[] = [];
  try {
    let out = await renderFigureInWorker(jobs, layout, review.figure.widthMm);
    if (out.svg.length > VECTOR_CAP_BYTES) {
      const reduced = jobs.map((j) => ({ ...j, data: Object.fromEntries(Object.entries(j.data).map(([k, rows]) => [k, reduceRowsForDisplay(rows).rows])) }));
      out = await renderFigureInWorker(reduced, layout, review.figure.widthMm);
      notes.push(
        `The full-resolution vector file would exceed ${VECTOR_CAP_BYTES / 1024 / 1024} MB; long series were reduced to the points that keep every extreme. Source data exports keep every point.`,
      );
    }
    if (out.heightMm > review.figure.maxHeightMm)
      notes.push(`The figure is ${out.heightMm.toFixed(1)} mm tall, above its maximum of ${review.figure.maxHeightMm} mm.`);
    return { svg: out.svg, widthMm: out.widthMm, heightMm: out.heightMm, notes: [...notes, ...out.warnings], houseStyle: describeHouseStyle(style) };
  } catch (err) {
    if (err instanceof RenderError) throw unprocessable(`The figure could not be rendered (${err.code}): ${err.message}`);
    throw err;
  }
}
