import "server-only";
import { getDb } from "@/db/client";
import { revisions } from "@/db/schema";
import { inArray } from "drizzle-orm";
import { reduceForDisplay } from "@/lib/data/display-reduction";
import { allRows, type RowTable } from "@/lib/data/table-rows";
import { RenderError, renderFigureInWorker, type FigureLayout, type FigurePanelJob, type RenderedFigure } from "../render/render-in-worker";
import { badRequest, unprocessable } from "@/lib/errors";
import { loadBoundTables } from "../figures/bindings";
import type { FigureReview } from "../review/review-context";
import { applyHouseStyle, describeHouseStyle, panelLetter, type HouseStyle } from "@/lib/figures/house-style";
import { houseStyleOf } from "../house-style";
import { shareYTitles } from "@/lib/figures/shared-titles";
import { gridPlacement } from "../render/worker/compose-core.mjs";

/** Past this the vector file becomes unwieldy for journals; long series are then reduced and the export says so. */
const VECTOR_CAP_BYTES = 20 * 1024 * 1024;
/** About what one drawn point takes in the SVG (measured: 100,000 points drew 42 MB). */
const BYTES_PER_MARK = 400;

export interface FigureRender {
  svg: string;
  widthMm: number;
  heightMm: number;
  notes: string[];
  /** The manuscript's house style the figure was drawn in, in words. */
  houseStyle: string;
}

type PanelTables = Record<string, RowTable>;
type PanelJob = Omit<FigurePanelJob, "data"> & { data: PanelTables };

/** Grid and panel letters as the house style sets them. */
export function figureLayout(columns: number, style: HouseStyle): FigureLayout {
  return { columns, letterFont: style.font, letterPt: style.letterPt, letterWeight: style.letterWeight };
}

/**
 * The panels as the renderer draws them, in figure order: each stored spec in the house style, its letter
 * in the house case, its bound rows; when the figure shares y titles, a row's repeated titles left out.
 */
export function figurePanelJobs(
  panels: Array<{ letter: string; spec: unknown; data: PanelTables; span: number }>,
  figure: { columns: number; shareYTitles: boolean },
  style: HouseStyle,
): PanelJob[] {
  const jobs = panels.map((p) => ({ letter: panelLetter(p.letter, style), spec: applyHouseStyle(p.spec, style), data: p.data, span: p.span }));
  if (!figure.shareYTitles) return jobs;
  const rows = gridPlacement(jobs, figure.columns).map((c) => c.row);
  return shareYTitles(
    jobs.map((j) => j.spec),
    rows,
  ).map((spec, i) => ({ ...jobs[i], spec }));
}

/**
 * Renders and composes the panels in the budgeted worker with the full data; when the vector file would
 * pass its cap, long series are reduced for display and drawn again (`reduced`).
 */
export async function drawFigure(jobs: PanelJob[], layout: FigureLayout, widthMm: number): Promise<{ figure: RenderedFigure; reduced: boolean }> {
  // Records are made here, just before the worker takes them: only the kept rows when reduced.
  const withRows = (rows: (t: RowTable) => FigurePanelJob["data"][string]): FigurePanelJob[] =>
    jobs.map((j) => ({ ...j, data: Object.fromEntries(Object.entries(j.data).map(([k, t]) => [k, rows(t)])) }));
  const reduced = () => withRows((t) => reduceForDisplay(t).rows);
  // A series this long cannot fit under the cap (every mark costs tens of bytes): reduced up front
  // rather than drawn in full, which can outlast the render budget, and then dropped.
  if (jobs.some((j) => Object.values(j.data).some((t) => t.length > VECTOR_CAP_BYTES / BYTES_PER_MARK))) {
    return { figure: await renderFigureInWorker(reduced(), layout, widthMm), reduced: true };
  }
  const figure = await renderFigureInWorker(withRows(allRows), layout, widthMm);
  if (figure.svg.length <= VECTOR_CAP_BYTES) return { figure, reduced: false };
  return { figure: await renderFigureInWorker(reduced(), layout, widthMm), reduced: true };
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
  const panels = await Promise.all(
    review.panels.map(async (p) => {
      const rev = revs.find((r) => r.id === p.revision!.id)!;
      return { letter: p.letter, spec: JSON.parse(rev.spec) as unknown, data: await loadBoundTables(rev.bound), span: p.panel.colSpan };
    }),
  );
  const jobs = figurePanelJobs(panels, review.figure, style);
  const layout = figureLayout(review.figure.columns, style);
  const notes: string[] = [];
  try {
    const { figure: out, reduced } = await drawFigure(jobs, layout, review.figure.widthMm);
    if (reduced) {
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
