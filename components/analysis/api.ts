import type { analysisCatalogue } from "@/lib/server/analyses/catalogue";
import type { populationStatistics } from "@/lib/server/analyses/population";
import type { previewGlobalFit } from "@/lib/server/analyses/global";
import type { compareCandidates } from "@/lib/server/analyses/compare";
import type { listAnalysesForVersion, previewAnalysis, runAnalysis } from "@/lib/server/analyses/run-analysis";
import type { FitOptions } from "@/lib/server/analyses/schemas";
import type { BatchEvent as ServerBatchEvent } from "@/lib/server/analyses/batch";
import type { BootstrapEvent as ServerBootstrapEvent } from "@/lib/server/analyses/bootstrap-preview";
import type { Wire } from "@/components/api-client";

export type { FitOptions };
type Catalogue = ReturnType<typeof analysisCatalogue>;
export type ModelInfo = Catalogue["items"][number];
export type FitResult = Wire<Awaited<ReturnType<typeof previewAnalysis>>>;
export type GlobalFitResult = Wire<Awaited<ReturnType<typeof previewGlobalFit>>>;
export type ComparisonResult = Wire<Awaited<ReturnType<typeof compareCandidates>>>;
export type SavedRun = Wire<Awaited<ReturnType<typeof runAnalysis>>>;
/** One line of the batch route's NDJSON answer. */
export type BatchEvent = Wire<ServerBatchEvent>;
/** One line of the bootstrap route's NDJSON answer. */
export type BootstrapEvent = Wire<ServerBootstrapEvent>;
export type FitParameter = FitResult["parameters"][number];
export type StoredRun = Wire<Awaited<ReturnType<typeof listAnalysesForVersion>>[number]>;
export type PopulationStats = Wire<Awaited<ReturnType<typeof populationStatistics>>>;

/** The part of a stored run's result this UI reads (the service stores describeRun without data and curve). */
export interface StoredResult {
  parameters?: FitParameter[];
  chi2red?: number | null;
  r2?: number | null;
  converged?: boolean;
  reason?: string;
  warnings?: string[];
  /** Absent on runs stored before fits were judged. */
  quality?: FitResult["quality"];
}
