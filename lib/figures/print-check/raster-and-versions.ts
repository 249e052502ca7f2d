/** The rules on exports and data: raster resolution, and every panel bound to its dataset's latest version. */
import { quote, type OlderVersion, type PrintCheckItem } from "./types";

/** Raster exports below this are refused by journals' artwork guides for line art and halftones alike. */
const MIN_RASTER_DPI = 300;

export function checkRasterDpi(accepted: number[], min = MIN_RASTER_DPI): PrintCheckItem {
  const low = accepted.filter((d) => d < min);
  return {
    id: "raster-dpi",
    label: `Raster exports at least ${min} dpi`,
    ok: low.length === 0 && accepted.length > 0,
    problems: low.map((d) => `raster exports accept ${d} dpi, below ${min}`),
    detail: `the PNG and TIFF exports offer ${accepted.join(", ")} dpi only`,
  };
}

export interface BoundVersion {
  panelId: string;
  panel: string;
  /** Data name in the spec. */
  name: string;
  dataset: string;
  number: number;
  latest: number;
  /** Via a fit: the version the analysis was run on. */
  viaAnalysis: boolean;
  /** The current revision's message of the panel. */
  message: string;
}

/** The revision message keeps this version on purpose: "keep version 1", "keeping v1 because …". */
export function keepsVersion(message: string, number: number): boolean {
  return new RegExp(`\\bkeep(?:s|ing)?\\b[^.;]*\\b(?:version|v)\\s*${number}\\b`, "i").test(message);
}

export function checkLatestVersions(bound: BoundVersion[]): PrintCheckItem {
  const problems: string[] = [];
  const keep: OlderVersion[] = [];
  let kept = 0;
  for (const b of bound) {
    if (b.number >= b.latest) continue;
    if (keepsVersion(b.message, b.number)) {
      kept++;
      continue;
    }
    if (!keep.some((k) => k.panelId === b.panelId && k.dataset === b.dataset && k.number === b.number))
      keep.push({ panelId: b.panelId, panel: b.panel, dataset: b.dataset, number: b.number, latest: b.latest });
    const what = b.viaAnalysis ? `the fit bound as “${b.name}” was run on` : `“${b.name}” is bound to`;
    problems.push(
      `panel ${b.panel}: ${what} ${quote(b.dataset)} version ${b.number}, but version ${b.latest} is the latest — rebind it, or keep version ${b.number} on purpose with a reason (saved as a revision note: “keep version ${b.number}: …”)`,
    );
  }
  return {
    id: "latest-data",
    label: "Every panel bound to its dataset's latest version (or kept on purpose)",
    ok: problems.length === 0,
    problems,
    ...(keep.length ? { keep } : {}),
    detail: `${bound.length} bound version${bound.length === 1 ? "" : "s"}${kept ? `, ${kept} older one${kept === 1 ? "" : "s"} kept on purpose` : ""}`,
  };
}
