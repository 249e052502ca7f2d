import type { getDataset, listDatasets } from "@/lib/server/datasets/read-datasets";
import type { VersionDto } from "@/lib/server/datasets/version-dto";
import type { Wire } from "@/components/api-client";

export type DatasetListItem = Wire<Awaited<ReturnType<typeof listDatasets>>[number]>;
export type DatasetDetail = Wire<Awaited<ReturnType<typeof getDataset>>>;
export type VersionView = Wire<VersionDto>;

export interface RowsPage {
  versionId: string;
  offset: number;
  limit: number;
  rowCount: number;
  columns: Array<{ name: string; unit: string | null; type: "number" | "string" }>;
  names: string[];
  rows: Array<Array<number | string | null>>;
}

export interface PlotData {
  x: { name: string; unit: string | null };
  y: { name: string; unit: string | null };
  rowCount: number;
  downsampled: boolean;
  points: { x: Array<number | null>; y: Array<number | null> };
}
