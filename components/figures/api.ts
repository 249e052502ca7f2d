import type { getFigure } from "@/lib/server/figures/figures";
import type { getPanel } from "@/lib/server/figures/panels";
import type { getRevision, listRevisions } from "@/lib/server/figures/revisions";
import type { traceFigure } from "@/lib/server/figures/trace";
import type { DataWarning } from "@/lib/server/figures/integrity";
import type { listThreads } from "@/lib/server/review/threads";
import type { listDatasets } from "@/lib/server/datasets/read-datasets";
import type { listAnalysesForVersion } from "@/lib/server/analyses/run-analysis";
import type { Wire } from "@/components/api-client";

export type FigureView = Wire<Awaited<ReturnType<typeof getFigure>>>;
export type FigurePanel = FigureView["panels"][number];
export type PanelView = Wire<Awaited<ReturnType<typeof getPanel>>>;
export type RevisionView = Wire<Awaited<ReturnType<typeof getRevision>>>;
export type RevisionListItem = Wire<Awaited<ReturnType<typeof listRevisions>>[number]>;
export type TraceView = Wire<Awaited<ReturnType<typeof traceFigure>>>;
export type ThreadView = Wire<Awaited<ReturnType<typeof listThreads>>[number]>;
export type DatasetItem = Wire<Awaited<ReturnType<typeof listDatasets>>[number]>;
export type AnalysisItem = Wire<Awaited<ReturnType<typeof listAnalysesForVersion>>[number]>;

export interface MemberView {
  userId: string;
  name: string;
  email: string;
  role: "pi" | "author" | "reviewer" | "viewer";
}

export type Row = Record<string, number | string | null>;
export interface BoundRows {
  rows: Row[];
  reduced: boolean;
  sourceRows: number;
}
/** A field the data lacks, data with no rows, rows left out (lib/server/figures/integrity). */
export type DataWarningView = DataWarning;
export interface RevisionData {
  revisionId: string;
  data: Record<string, BoundRows>;
  warnings?: DataWarningView[];
}

/** A binding as the API stores it. */
export type Binding = { versionId: string } | { analysisId: string; output: "curve" | "residuals" | "data" | "parameters" };

export type ThreadAnchor = { type: "point"; x: number; y: number } | { type: "xrange"; x0: number; x1: number };

export const queryKeys = {
  figure: (id: string) => ["figure", id] as const,
  trace: (id: string) => ["figure-trace", id] as const,
  panel: (id: string) => ["panel", id] as const,
  revisions: (panelId: string) => ["panel-revisions", panelId] as const,
  revision: (id: string) => ["revision", id] as const,
  revisionData: (id: string) => ["revision-data", id] as const,
  threads: (panelId: string) => ["panel-threads", panelId] as const,
  datasets: (manuscriptId: string) => ["datasets", manuscriptId] as const,
  analyses: (versionId: string) => ["version-analyses", versionId] as const,
  versionRows: (versionId: string) => ["version-rows-all", versionId] as const,
};
