import "server-only";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { sha256Hex } from "../crypto";

/** The figure hash signs the layout plus every panel's content hash, in order. */
export function figureContentHash(
  f: { widthMm: number; maxHeightMm: number; columns: number; title: string },
  panelHashes: Array<{ letter: string; colSpan: number; contentHash: string | null }>,
): string {
  return sha256Hex(canonicalJson({ layout: { widthMm: f.widthMm, maxHeightMm: f.maxHeightMm, columns: f.columns, title: f.title }, panels: panelHashes }));
}
