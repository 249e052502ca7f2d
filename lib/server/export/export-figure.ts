import "server-only";
import { z } from "zod";
import { getDb } from "@/db/client";
import { authorize, type SessionUser } from "@/lib/authz";
import { appendAudit } from "../audit";
import { notFound } from "@/lib/errors";
import { manuscriptOfFigure } from "../figures/scope";
import { svgToPdf } from "../render/to-pdf";
import { printPng, printTiff } from "../render/to-print-raster";
import { svgForExport } from "../render/svg-text";
import { loadReviewContext } from "../review/review-context";
import { writeBundle } from "./bundle";
import { ExportBody } from "./export-body";
import { DRAFT_MARK_TEXT, withDraftMark } from "./draft-mark";
import { renderFigureSvg } from "./render-figure";
import { sourceDataZip } from "./source-data";
import { sourceDataWorkbook } from "./source-data-xlsx";

const FORMATS = ["svg", "pdf", "png", "tiff", "xlsx", "source-data", "bundle"] as const;

export const exportQuery = z.object({
  format: z.enum(FORMATS, { message: `format must be ${FORMATS.slice(0, -1).join(", ")} or ${FORMATS.at(-1)}` }),
  dpi: z.coerce
    .number()
    .refine((d) => d === 300 || d === 600 || d === 1200, "dpi must be 300, 600 or 1200")
    .default(300),
  /** Raster files (PNG, TIFF): RGB or greyscale, always flattened onto white (no alpha). */
  colour: z.enum(["rgb", "grey"], { message: "colour must be rgb or grey" }).default("rgb"),
  /** SVG text: glyphs converted to outlines, or live text with the fonts embedded. */
  text: z.enum(["outlines", "embedded"], { message: "text must be outlines or embedded" }).default("outlines"),
  /** "off" leaves out the draft mark on a figure that is not signed off (recorded in the audit log). */
  mark: z.enum(["on", "off"], { message: "mark must be on or off" }).default("on"),
});

const TYPES = {
  svg: "image/svg+xml",
  pdf: "application/pdf",
  png: "image/png",
  tiff: "image/tiff",
  xlsx: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
  "source-data": "application/zip",
  bundle: "application/zip",
} as const;

/**
 * The files to submit: the figure (SVG with outlined or embedded text, PDF, PNG and LZW TIFF at
 * 300/600/1200 dpi in RGB or grey), its source data, the reproducibility bundle — all in the
 * manuscript's house style.
 */
export async function exportFigure(user: SessionUser, figureId: string, raw: z.infer<typeof exportQuery>) {
  const manuscriptId = await manuscriptOfFigure(figureId);
  await authorize(user, "manuscript.export", manuscriptId);
  const { format, dpi, mark, colour, text } = exportQuery.parse(raw);
  const [review] = await loadReviewContext({ figureId });
  if (!review) throw notFound();
  const base = `figure-${review.figure.number}`;
  let body: ExportBody;
  let notes: string[] = [];
  let rendered: Awaited<ReturnType<typeof renderFigureSvg>> | undefined;
  // A figure not signed off on its current hash carries a visible mark unless the exporter opts out.
  const signedOff = review.state === "signed_off";
  const draftMarked = !signedOff && mark === "on";
  if (format === "source-data") {
    body = await sourceDataZip(review);
  } else if (format === "xlsx") {
    body = await sourceDataWorkbook(review);
  } else {
    rendered = await renderFigureSvg(review);
    notes = rendered.notes;
    const svg = draftMarked ? withDraftMark(rendered.svg, review.figureHash) : rendered.svg;
    const status = draftMarked ? DRAFT_MARK_TEXT : signedOff ? "Signed off on this figure hash" : `${DRAFT_MARK_TEXT} (mark left out by the exporter)`;
    const description = `${status}; figure hash ${review.figureHash}`;
    if (format === "svg") body = ExportBody.ofBytes(new TextEncoder().encode(svgForExport(svg, text)));
    else if (format === "png") body = ExportBody.ofBytes((await printPng(svg, { dpi, colour, description })).bytes);
    else if (format === "tiff") body = ExportBody.ofBytes((await printTiff(svg, { dpi, colour })).bytes);
    else {
      const title = `Figure ${review.figure.number}: ${review.figure.title}`;
      const pdf = new Uint8Array(await svgToPdf(svg, { title, subject: `${status}; figure hash ${review.figureHash}` }));
      body = format === "pdf" ? ExportBody.ofBytes(pdf) : await writeBundle(user, review, { svg, pdf });
    }
  }
  try {
    await getDb().transaction(async (tx) => {
      await appendAudit(tx, {
        actorId: user.id,
        manuscriptId,
        action: "figure.export",
        target: `figure:${figureId}`,
        data: {
          format,
          ...(format === "png" || format === "tiff" ? { dpi, colour } : {}),
          ...(format === "svg" ? { text } : {}),
          houseStyle: rendered?.houseStyle,
          figureHash: review.figureHash,
          bytes: body.byteLength,
          signedOff,
          draftMark: draftMarked,
          ...(mark === "off" && !signedOff ? { draftMarkLeftOut: true } : {}),
        },
      });
    });
  } catch (err) {
    // Not recorded, so not handed out: the written file goes too.
    await body.discard();
    throw err;
  }
  const raster = `${dpi}dpi${colour === "grey" ? "-grey" : ""}`;
  const ext = {
    svg: "svg",
    pdf: "pdf",
    png: `${raster}.png`,
    tiff: `${raster}.tif`,
    xlsx: "source-data.xlsx",
    "source-data": "source-data.zip",
    bundle: "bundle.zip",
  }[format];
  return {
    body,
    notes,
    headers: {
      "content-type": TYPES[format],
      "content-length": String(body.byteLength),
      "content-disposition": `attachment; filename="${base}.${ext}"`,
      "x-figure-hash": review.figureHash,
      "x-signed-off": signedOff ? "yes" : "no",
      ...(notes.length ? { "x-export-notes": encodeURIComponent(notes.join(" | ")) } : {}),
    },
  };
}
