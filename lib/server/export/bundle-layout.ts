import "server-only";
import type { StoredColumn, StoredSummary } from "@/db/schema";
import type { HouseStyle } from "@/lib/figures/house-style";

/** Where the reproducibility bundle keeps what verifying it needs (besides raw/, derived/, fits/ and figure.svg). */
export const BUNDLE_PATHS = {
  metadata: "ro-crate-metadata.json",
  figureSvg: "figure.svg",
  render: "render.json",
  parsed: "data/parsed.json",
  spec: (letter: string) => `specs/panel-${letter}.vl.json`,
  panelData: (letter: string) => `data/panel-${letter}.json`,
} as const;

/** A raw or derived file as the application parsed it on upload (data/parsed.json, by path in the bundle). */
export interface BundleParseRecord {
  versionId: string;
  fileName: string;
  format: string;
  encoding: string;
  delimiter: string | null;
  decimal: string;
  warnings: string[];
  rowCount: number;
  columns: StoredColumn[];
  summary: StoredSummary[];
}

/**
 * One bound data name of a panel: the file its rows come from, the fit report for a fit output, and
 * the rows drawn, column by column (`values[j][i]` is row i of `columns[j]`; a missing number is null),
 * which reads back as a few arrays rather than an object per row.
 */
export interface BundleBoundData {
  file: string;
  /** The fit report (fits/….json) when the name is bound to a fit's output. */
  fit?: string;
  /** curve, data, residuals or parameters for a fit's output; absent for a dataset version. */
  output?: string | null;
  columns: string[];
  values: Array<Array<number | string | null>>;
}

/** data/panel-<letter>.json: the rows each data name of the panel's revision resolved to, at full resolution. */
export interface BundlePanelData {
  panel: string;
  revision: number;
  contentHash: string;
  data: Record<string, BundleBoundData>;
}

/** render.json: how figure.svg was drawn (before any draft mark), panels in figure order. */
export interface BundleRender {
  figureHash: string;
  widthMm: number;
  columns: number;
  /** Later panels of a grid row leave out a y title that repeats the row's first (a figure setting). */
  shareYTitles: boolean;
  houseStyle: HouseStyle;
  panels: Array<{ letter: string; span: number; spec: string; data: string }>;
}
