import "server-only";
import type { FigureTrace } from "../figures/trace";
import type { FigureReview } from "../review/review-context";

/** One entity of the RO-Crate graph (ro-crate-metadata.json). */
export type Entity = Record<string, unknown> & { "@id": string; "@type": string };
export const ref = (id: string) => ({ "@id": id });
export const iso = (d: Date | string) => new Date(d).toISOString();

/**
 * The figure's review history in the crate: each decision an AssessAction on its panel revision, each
 * sign-off an EndorseAction on the figure at the hash it signed (and its withdrawal, if any).
 */
export function putReviewActions(
  trace: FigureTrace,
  review: FigureReview,
  put: (e: Entity) => { "@id": string },
  personRef: (p: { id: string; name: string }) => { "@id": string },
): void {
  const figureEntity = (hash: string) =>
    put({
      "@id": `#figure-${hash}`,
      "@type": "CreativeWork",
      name: `Figure ${review.figure.number} at hash ${hash.slice(0, 12)}${hash === review.figureHash ? "" : " (an earlier state)"}`,
      identifier: hash,
    });
  figureEntity(review.figureHash);

  for (const d of trace.decisions) {
    const revision = put({
      "@id": `#revision-${d.revisionId}`,
      "@type": "CreativeWork",
      name: `Panel ${d.panelLetter}, revision ${d.revisionNumber ?? "?"}`,
      identifier: d.contentHash,
    });
    put({
      "@id": `#decision-${d.id}`,
      "@type": "AssessAction",
      name: `Panel ${d.panelLetter}, revision ${d.revisionNumber ?? "?"}: ${d.decision === "approved" ? "approved" : "needs revision"}${d.stale ? " (stale)" : ""}`,
      object: revision,
      agent: personRef(d.by),
      endTime: iso(d.createdAt),
      ...(d.note ? { description: d.note } : {}),
    });
  }
  for (const s of trace.signoffs) {
    put({
      "@id": `#signoff-${s.id}`,
      "@type": "EndorseAction",
      name: `Figure ${review.figure.number} signed off${s.withdrawn ? " (withdrawn)" : s.stale ? " (stale)" : ""}`,
      object: figureEntity(s.figureHash),
      agent: personRef(s.by),
      endTime: iso(s.createdAt),
      ...(s.reason ? { description: s.reason } : {}),
    });
    if (s.withdrawn)
      put({
        "@id": `#signoff-${s.id}-withdrawn`,
        "@type": "AssessAction",
        name: `Sign-off of Figure ${review.figure.number} withdrawn`,
        object: ref(`#signoff-${s.id}`),
        agent: personRef(s.withdrawn.by),
        endTime: iso(s.withdrawn.at),
        ...(s.withdrawn.reason ? { description: s.withdrawn.reason } : {}),
      });
  }
}

/** The latest recorded event of the figure's trace: the bundle's publication date and the PDF's creation date. */
export function lastChange(trace: FigureTrace): Date {
  const times: Array<Date | string> = [];
  for (const p of trace.panels) {
    if (p.revision) times.push(p.revision.createdAt);
    for (const i of p.inputs) {
      if (i.kind === "version") times.push(i.version.createdAt);
      else times.push(i.analysis.createdAt, i.input.createdAt, i.derived.createdAt);
    }
  }
  for (const d of trace.decisions) times.push(d.createdAt);
  for (const s of trace.signoffs) times.push(s.createdAt, ...(s.withdrawn ? [s.withdrawn.at] : []));
  return new Date(Math.max(0, ...times.map((t) => new Date(t).getTime())));
}

/** IANA media types of the files people upload (by extension); anything else is application/octet-stream. */
export function mediaTypeOf(fileName: string): string {
  const ext = /\.([^.]+)$/.exec(fileName.toLowerCase())?.[1] ?? "";
  const known: Record<string, string> = {
    csv: "text/csv",
    tsv: "text/tab-separated-values",
    txt: "text/plain",
    dat: "text/plain",
    asc: "text/plain",
    json: "application/json",
  };
  return known[ext] ?? "application/octet-stream";
}
