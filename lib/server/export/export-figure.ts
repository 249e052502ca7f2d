import "server-only";
import { z } from "zod";
import { getDb } from "@/db/client";
import { authorize, type SessionUser } from "@/lib/authz";
import { appendAudit } from "../audit";
import { notFound } from "@/lib/errors";
import { manuscriptOfFigure } from "../figures/scope";
import { svgToPdf } from "../render/to-pdf";
import { svgToPng } from "../render/to-png";
import { loadReviewContext } from "../review/review-context";
import { bundleFiles } from "./bundle";
import { renderFigureSvg } from "./render-figure";
import { sourceDataFiles, zip } from "./source-data";

export const exportQuery = z.object({
  format: z.enum(["svg", "pdf", "png", "source-data", "bundle"], { message: "format must be svg, pdf, png, source-data or bundle" }),
  dpi: z.coerce
    .number()
    .refine((d) => d === 300 || d === 600, "dpi must be 300 or 600")
    .default(300),
});

const TYPES = { svg: "image/svg+xml", pdf: "application/pdf", png: "image/png", "source-data": "application/zip", bundle: "application/zip" } as const;

/** The files to submit: the figure (SVG, PDF, PNG at 300/600 dpi), its source data, the reproducibility bundle. */
export async function exportFigure(user: SessionUser, figureId: string, raw: z.infer<typeof exportQuery>) {
  const manuscriptId = await manuscriptOfFigure(figureId);
  await authorize(user, "manuscript.export", manuscriptId);
  const { format, dpi } = exportQuery.parse(raw);
  const [review] = await loadReviewContext({ figureId });
  if (!review) throw notFound();
  const base = `figure-${review.figure.number}`;
  let body: Uint8Array;
  let notes: string[] = [];
  if (format === "source-data") {
    body = zip(await sourceDataFiles(review));
  } else {
    const rendered = await renderFigureSvg(review);
    notes = rendered.notes;
    if (format === "svg") body = new TextEncoder().encode(rendered.svg);
    else if (format === "png") body = svgToPng(rendered.svg, { dpi }).png;
    else {
      const pdf = new Uint8Array(await svgToPdf(rendered.svg, { title: `Figure ${review.figure.number}: ${review.figure.title}` }));
      body = format === "pdf" ? pdf : zip(await bundleFiles(user, review, { svg: rendered.svg, pdf }));
    }
  }
  await getDb().transaction(async (tx) => {
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId,
      action: "figure.export",
      target: `figure:${figureId}`,
      data: { format, dpi, figureHash: review.figureHash, bytes: body.byteLength },
    });
  });
  const ext = { svg: "svg", pdf: "pdf", png: `${dpi}dpi.png`, "source-data": "source-data.zip", bundle: "bundle.zip" }[format];
  return {
    body,
    notes,
    headers: {
      "content-type": TYPES[format],
      "content-length": String(body.byteLength),
      "content-disposition": `attachment; filename="${base}.${ext}"`,
      "x-figure-hash": review.figureHash,
      ...(notes.length ? { "x-export-notes": encodeURIComponent(notes.join(" | ")) } : {}),
    },
  };
}
