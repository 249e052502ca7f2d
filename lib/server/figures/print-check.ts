import "server-only";
import { eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { analyses, datasets, versions, type BoundInput } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { AppError, notFound } from "@/lib/errors";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import {
  checkAxes,
  checkColourPairs,
  checkErrorBars,
  checkFigureSize,
  checkGroupN,
  checkLatestVersions,
  checkRasterDpi,
  checkTextSizes,
  readFigureSvg,
  type BoundVersion,
  type PanelWords,
  type PrintCheck,
  type PrintCheckId,
  type PrintCheckItem,
  type SvgMarkColours,
  type SvgText,
} from "@/lib/figures/print-check";
import { exportQuery } from "../export/export-figure";
import { renderFigureSvg } from "../export/render-figure";
import { houseStyleOf } from "../house-style";
import { loadReviewContext, type FigureReview } from "../review/review-context";
import { manuscriptOfFigure } from "./scope";

/** Resolutions a person might ask for; the ones the export's own validation accepts are what it offers. */
const DPI_CANDIDATES = [72, 96, 150, 200, 250, 300, 400, 600, 1200, 2400];

/** What the composed figure SVG says: texts, data colours, size. */
interface Drawn {
  texts: SvgText[];
  marks: SvgMarkColours[];
  widthMm: number;
  heightMm: number;
}

/** Drawings by figure hash + house style + shared titles (a revision's content never changes under its hash). */
const drawnCache = new Map<string, Drawn>();
const CACHE_ENTRIES = 200;

async function drawnFigure(review: FigureReview): Promise<Drawn | { error: string }> {
  const style = await houseStyleOf(review.figure.manuscriptId);
  const key = canonicalJson({ hash: review.figureHash, style, shared: review.figure.shareYTitles });
  const hit = drawnCache.get(key);
  if (hit) return hit;
  let render;
  try {
    render = await renderFigureSvg(review);
  } catch (err) {
    // A figure the renderer refuses (422) is a failed check, not a failed request: the PI can still sign with a reason.
    if (err instanceof AppError && err.status === 422) return { error: err.message };
    throw err;
  }
  const { texts, marks } = readFigureSvg(render.svg);
  const lower = <T extends { panel: string | null }>(x: T): T => ({ ...x, panel: x.panel?.toLowerCase() ?? null });
  const drawn: Drawn = {
    texts: texts.map(lower),
    marks: marks.map((m) => ({ ...m, panel: m.panel.toLowerCase() })),
    widthMm: render.widthMm,
    heightMm: render.heightMm,
  };
  if (drawnCache.size >= CACHE_ENTRIES) drawnCache.delete(drawnCache.keys().next().value as string);
  drawnCache.set(key, drawn);
  return drawn;
}

/** The bound versions of each panel (and the versions its fits ran on), with their dataset's latest number. */
async function boundVersions(panels: Array<{ id: string; letter: string; bound: Record<string, BoundInput>; message: string }>): Promise<{
  list: BoundVersion[];
  headers: Map<string, Record<string, string>>;
}> {
  const analysisIds = [
    ...new Set(
      panels.flatMap((p) =>
        Object.values(p.bound)
          .filter((b) => b.kind === "analysis")
          .map((b) => b.id),
      ),
    ),
  ];
  const runs = analysisIds.length
    ? await getDb().select({ id: analyses.id, versionId: analyses.versionId }).from(analyses).where(inArray(analyses.id, analysisIds))
    : [];
  const inputOf = new Map(runs.map((r) => [r.id, r.versionId]));
  const versionIds = [...new Set(panels.flatMap((p) => Object.values(p.bound).flatMap((b) => [b.versionId, inputOf.get(b.id) ?? b.versionId])))];
  const rows = versionIds.length
    ? await getDb()
        .select({ id: versions.id, number: versions.number, datasetId: versions.datasetId, name: datasets.name, parseInfo: versions.parseInfo })
        .from(versions)
        .innerJoin(datasets, eq(datasets.id, versions.datasetId))
        .where(inArray(versions.id, versionIds))
    : [];
  const datasetIds = [...new Set(rows.map((r) => r.datasetId))];
  const numbers = datasetIds.length
    ? await getDb().select({ datasetId: versions.datasetId, number: versions.number }).from(versions).where(inArray(versions.datasetId, datasetIds))
    : [];
  const latest = new Map<string, number>();
  for (const n of numbers) latest.set(n.datasetId, Math.max(latest.get(n.datasetId) ?? 0, n.number));
  const byId = new Map(rows.map((r) => [r.id, r]));
  const list: BoundVersion[] = [];
  for (const p of panels) {
    for (const [name, b] of Object.entries(p.bound)) {
      // A version bound directly; for a fit, the measured version it was run on (its derived file is new with every run).
      const viaAnalysis = b.kind === "analysis";
      const v = byId.get(viaAnalysis ? (inputOf.get(b.id) ?? b.versionId) : b.versionId);
      if (!v) continue;
      list.push({
        panelId: p.id,
        panel: p.letter,
        name,
        dataset: v.name,
        number: v.number,
        latest: latest.get(v.datasetId) ?? v.number,
        viaAnalysis,
        message: p.message,
      });
    }
  }
  return { list, headers: new Map(rows.map((r) => [r.id, r.parseInfo.headerMetadata ?? {}])) };
}

const ITEM_ORDER: PrintCheckId[] = ["text-size", "figure-size", "axis-units", "colour-pairs", "error-bars", "group-n", "raster-dpi", "latest-data"];

/** An item the drawing decides, when there is no drawing. */
const undrawn = (id: PrintCheckId, label: string, why: string): PrintCheckItem => ({ id, label, ok: false, problems: [why] });

/** The print check of a figure as it stands (its current revisions, the manuscript's house style). */
export async function printCheckOf(review: FigureReview): Promise<PrintCheck> {
  const fig = review.figure;
  const withRevision = review.panels.filter((p) => p.revision);
  const panels = withRevision.map((p) => ({
    id: p.panel.id,
    letter: p.letter,
    title: p.panel.title,
    spec: JSON.parse(p.revision!.spec) as unknown,
    bound: p.revision!.bound,
    message: p.revision!.message,
  }));
  const missing = review.panels.filter((p) => !p.revision).map((p) => p.letter);
  const why = !review.panels.length
    ? "the figure has no panels yet"
    : missing.length
      ? `panel ${missing.join(", ")} has no revision yet, so the figure cannot be drawn`
      : null;
  const drawn = why ? { error: why } : await drawnFigure(review);
  const { list, headers } = await boundVersions(panels);
  const words: PanelWords[] = panels.map((p) => ({
    letter: p.letter,
    spec: p.spec,
    words: [p.title, p.message],
    headers: Object.values(p.bound).map((b) => headers.get(b.versionId) ?? {}),
    drawn: "error" in drawn ? [] : drawn.texts.filter((t) => t.panel === p.letter).map((t) => t.text),
  }));
  const accepted = DPI_CANDIDATES.filter((d) => exportQuery.shape.dpi.safeParse(d).success);
  const items: PrintCheckItem[] =
    "error" in drawn
      ? [
          undrawn("text-size", "Every text at least 5 pt at the figure's width", drawn.error),
          undrawn("figure-size", `Within ${fig.widthMm} mm wide and ${fig.maxHeightMm} mm tall`, drawn.error),
          undrawn("colour-pairs", "Data colours apart under deuteranopia, protanopia and tritanopia", drawn.error),
        ]
      : [
          checkTextSizes(drawn.texts, fig.widthMm),
          checkFigureSize({ widthMm: drawn.widthMm, heightMm: drawn.heightMm, targetWidthMm: fig.widthMm, maxHeightMm: fig.maxHeightMm }),
          checkColourPairs(drawn.marks),
        ];
  items.push(checkAxes(panels), checkErrorBars(words), checkGroupN(words), checkRasterDpi(accepted), checkLatestVersions(list));
  items.sort((a, b) => ITEM_ORDER.indexOf(a.id) - ITEM_ORDER.indexOf(b.id));
  return { ok: items.every((i) => i.ok), figureHash: review.figureHash, items };
}

/** `GET /api/figures/{id}/print-check`. */
export async function figurePrintCheck(user: SessionUser, figureId: string): Promise<PrintCheck> {
  await authorize(user, "manuscript.read", await manuscriptOfFigure(figureId));
  const [review] = await loadReviewContext({ figureId });
  if (!review) throw notFound();
  return printCheckOf(review);
}
