/**
 * Thumbnails of figures and panels for the manuscript, figure-status and figure pages: a small PNG
 * drawn by the same budgeted renderer as the exports, made lazily on the first request and kept
 * in the store's cache (`uploads/cache/thumbs/`, or the bucket every instance shares) by content hash (figure: the figure hash; panel: its current
 * revision's content hash). A new revision changes the hash, so the next request draws a new one;
 * old files are never read again (the cache is rebuildable and may be deleted at any time).
 *
 * Never a 500 for a picture: a figure without panels, a panel without a revision and a render
 * that fails all answer a labelled placeholder PNG (failures are not cached).
 */
import "server-only";
import fsp from "node:fs/promises";
import { eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { panels, revisions, type BoundInput } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { notFound } from "@/lib/errors";
import { loadBoundTables } from "../figures/bindings";
import { reduceForDisplay } from "@/lib/data/display-reduction";
import { manuscriptOfFigure, manuscriptOfPanel } from "../figures/scope";
import { renderFigureInWorker, renderSpecInWorker, type FigurePanelJob } from "../render/render-in-worker";
import { svgToPng } from "../render/to-png";
import { loadReviewContext } from "../review/review-context";
import { tempPath } from "../storage/blob-store";
import { blobStore } from "../storage/store";

/** Pixel width of every thumbnail (shown at up to 240 CSS px, so sharp on 2× screens). */
const THUMB_WIDTH_PX = 480;
/** Panels are drawn at one journal column, whatever their span in the figure, so the picture depends on the revision alone. */
const PANEL_WIDTH_MM = 89;
/** Thumbnails drawn at once; each takes a render process (≈ 100 MB), and a page of figures asks for all of them together. */
const MAX_CONCURRENT = 2;
/** A thumbnail that matches the hash its URL names never changes; without one it is rechecked after a minute. */
const MAX_AGE_VERSIONED = 86_400;
const MAX_AGE_UNVERSIONED = 60;
const MAX_AGE_FAILED = 30;

const SHA256 = /^[0-9a-f]{64}$/;

/** `?v=<hash prefix>`: the hash the page saw, so a new hash is a new URL and the browser never shows an old picture. */
export const thumbnailQuery = z.object({
  v: z
    .string()
    .regex(/^[0-9a-f]{8,64}$/, "v must be the content hash (8 to 64 lowercase hex digits) the page saw")
    .optional(),
});

interface Thumbnail {
  png: Uint8Array;
  /** The figure hash or revision content hash drawn; null for a placeholder without content. */
  hash: string | null;
  /** "ok": drawn from content; "empty": nothing to draw yet; "failed": the render failed (not cached). */
  kind: "ok" | "empty" | "failed";
}

/** The thumbnail's name in the store's cache: uploads/cache/thumbs/<kind>-<hash>.png on disk, shared in a bucket. */
function thumbnailCacheName(kind: "figure" | "panel", hash: string): string {
  if (!SHA256.test(hash)) throw new Error("not a sha256");
  return `thumbs/${kind}-${hash}.png`;
}

// ---- a small queue so a page of thumbnails does not start one render process per figure ----

let running = 0;
const waiting: Array<() => void> = [];

async function limited<T>(fn: () => Promise<T>): Promise<T> {
  if (running >= MAX_CONCURRENT) await new Promise<void>((resolve) => waiting.push(resolve));
  running++;
  try {
    return await fn();
  } finally {
    running--;
    waiting.shift()?.();
  }
}

/** Requests for the same file while it is being drawn share the one render. */
const inFlight = new Map<string, Promise<Thumbnail>>();

async function cachedOrDrawn(what: "figure" | "panel", hash: string, draw: () => Promise<Uint8Array>): Promise<Thumbnail> {
  const file = thumbnailCacheName(what, hash);
  const kept = await blobStore().readCache(file);
  if (kept) return { png: kept, hash, kind: "ok" };
  const pending = inFlight.get(file);
  if (pending) return pending;
  const job = limited<Thumbnail>(async () => {
    try {
      const png = await draw();
      const tmp = tempPath();
      await fsp.writeFile(tmp, png);
      await blobStore().putCache(file, tmp);
      return { png, hash, kind: "ok" };
    } catch (err) {
      console.warn(`[prooflight] the ${what} thumbnail ${hash.slice(0, 12)} could not be drawn: ${(err as Error)?.message ?? err}`);
      return { png: placeholderPng("Could not be drawn", "open it to see why"), hash, kind: "failed" };
    }
  }).finally(() => inFlight.delete(file));
  inFlight.set(file, job);
  return job;
}

// ---- drawing ----

/** Print dpi that makes `widthMm` come out THUMB_WIDTH_PX wide (within what svgToPng accepts). */
function dpiFor(widthMm: number): number {
  return Math.min(2400, Math.max(30, (THUMB_WIDTH_PX / widthMm) * 25.4));
}

/** Bound rows reduced as for the browser (extremes kept): a thumbnail needs no more, and renders faster. */
async function thumbnailData(bound: Record<string, BoundInput>) {
  const tables = await loadBoundTables(bound);
  return Object.fromEntries(Object.entries(tables).map(([name, t]) => [name, reduceForDisplay(t).rows]));
}

const escapeXml = (s: string) => s.replace(/[<>&"']/g, (c) => ({ "<": "&lt;", ">": "&gt;", "&": "&amp;", '"': "&quot;", "'": "&apos;" })[c]!);

const placeholders = new Map<string, Uint8Array>();

/** A dashed frame with one or two centred lines, as a PNG of the thumbnail width. */
function placeholderPng(title: string, detail: string): Uint8Array {
  const key = `${title}\n${detail}`;
  const known = placeholders.get(key);
  if (known) return known;
  const [w, h] = [240, 150]; // pt; 84.7 × 52.9 mm
  const svg =
    `<svg xmlns="http://www.w3.org/2000/svg" width="${(w / 72) * 25.4}mm" height="${(h / 72) * 25.4}mm" viewBox="0 0 ${w} ${h}">` +
    `<rect x="4" y="4" width="${w - 8}" height="${h - 8}" fill="#f7f5f0" stroke="#8a8577" stroke-width="1.5" stroke-dasharray="6 4"/>` +
    `<text x="${w / 2}" y="${h / 2 - 4}" text-anchor="middle" font-family="Inter" font-weight="600" font-size="15" fill="#3d3a33">${escapeXml(title)}</text>` +
    `<text x="${w / 2}" y="${h / 2 + 16}" text-anchor="middle" font-family="Inter" font-size="11" fill="#5c584e">${escapeXml(detail)}</text>` +
    `</svg>`;
  const png = new Uint8Array(svgToPng(svg, { dpi: dpiFor((w / 72) * 25.4) }).png);
  placeholders.set(key, png);
  return png;
}

/** Stands in for a panel without a revision inside a figure thumbnail, so the other panels keep their places. */
const EMPTY_PANEL_SPEC = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  height: 120,
  data: { name: "empty" },
  mark: { type: "text", fontSize: 11, color: "#5c584e" },
  encoding: { text: { field: "label" }, x: { value: 100 }, y: { value: 60 } },
  config: { view: { stroke: "#8a8577", strokeDash: [6, 4] } },
};

async function drawFigure(review: NonNullable<Awaited<ReturnType<typeof loadReviewContext>>[number]>): Promise<Uint8Array> {
  const jobs: FigurePanelJob[] = await Promise.all(
    review.panels.map(async (p) =>
      p.revision
        ? { letter: p.letter, spec: JSON.parse(p.revision.spec) as unknown, data: await thumbnailData(p.revision.bound), span: p.panel.colSpan }
        : { letter: p.letter, spec: EMPTY_PANEL_SPEC, data: { empty: [{ label: "no revision yet" }] }, span: p.panel.colSpan },
    ),
  );
  const out = await renderFigureInWorker(jobs, { columns: review.figure.columns }, review.figure.widthMm);
  return new Uint8Array(svgToPng(out.svg, { dpi: dpiFor(out.widthMm) }).png);
}

async function drawPanel(rev: { spec: string; bound: Record<string, BoundInput> }): Promise<Uint8Array> {
  const out = await renderSpecInWorker(JSON.parse(rev.spec) as unknown, await thumbnailData(rev.bound), { widthMm: PANEL_WIDTH_MM });
  return new Uint8Array(svgToPng(out.svg, { dpi: dpiFor(out.widthMm) }).png);
}

// ---- services ----

/** The whole figure, composed as it exports, small; cached by figure hash. */
export async function figureThumbnail(user: SessionUser, figureId: string): Promise<Thumbnail> {
  const manuscriptId = await manuscriptOfFigure(figureId);
  await authorize(user, "manuscript.read", manuscriptId);
  const [review] = await loadReviewContext({ figureId });
  if (!review) throw notFound();
  if (!review.panels.length) return { png: placeholderPng("No panels yet", "add one on the figure page"), hash: review.figureHash, kind: "empty" };
  return cachedOrDrawn("figure", review.figureHash, () => drawFigure(review));
}

/** One panel's current revision at one journal column, small; cached by the revision's content hash. */
export async function panelThumbnail(user: SessionUser, panelId: string): Promise<Thumbnail> {
  const manuscriptId = await manuscriptOfPanel(panelId);
  await authorize(user, "manuscript.read", manuscriptId);
  const [row] = await getDb()
    .select({ spec: revisions.spec, bound: revisions.bound, contentHash: revisions.contentHash })
    .from(panels)
    .leftJoin(revisions, eq(revisions.id, panels.currentRevisionId))
    .where(eq(panels.id, panelId));
  if (!row) throw notFound();
  if (!row.contentHash || row.spec === null || row.bound === null)
    return { png: placeholderPng("No revision yet", "open the panel to build it"), hash: null, kind: "empty" };
  const rev = { spec: row.spec, bound: row.bound };
  return cachedOrDrawn("panel", row.contentHash, () => drawPanel(rev));
}

/**
 * The HTTP answer: the PNG with `cache-control: private` and the hash as ETag (304 when the
 * browser already has it). Long-lived when the URL names the hash drawn (`?v=`), short otherwise.
 */
export function thumbnailResponse(req: Request, query: z.infer<typeof thumbnailQuery> | undefined, t: Thumbnail): Response {
  const etag = t.hash ? `"${t.kind === "ok" ? "" : `${t.kind}-`}${t.hash}"` : `"${t.kind}"`;
  const versioned = Boolean(query?.v && t.hash?.startsWith(query.v));
  const maxAge = t.kind === "failed" ? MAX_AGE_FAILED : versioned ? MAX_AGE_VERSIONED : MAX_AGE_UNVERSIONED;
  const headers: Record<string, string> = {
    "cache-control": `private, max-age=${maxAge}`,
    etag,
    "x-thumbnail": t.kind,
  };
  const seen = req.headers.get("if-none-match");
  if (t.kind !== "failed" && seen && seen.split(/\s*,\s*/).some((tag) => tag.replace(/^W\//, "") === etag)) return new Response(null, { status: 304, headers });
  return new Response(t.png as BodyInit, { headers: { ...headers, "content-type": "image/png", "content-length": String(t.png.byteLength) } });
}
