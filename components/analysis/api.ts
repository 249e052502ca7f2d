import type { analysisCatalogue } from "@/lib/server/analyses/catalogue";
import type { populationStatistics } from "@/lib/server/analyses/population";
import type { listAnalysesForVersion, previewAnalysis, runAnalysis } from "@/lib/server/analyses/run-analysis";
import type { FitOptions } from "@/lib/server/analyses/schemas";

/** What JSON makes of a server type: dates arrive as strings (server components still pass Dates). */
export type Wire<T> = T extends Date ? Date | string
  : T extends Array<infer U> ? Array<Wire<U>>
  : T extends object ? { [K in keyof T]: Wire<T[K]> }
  : T;

export type { FitOptions };
export type Catalogue = ReturnType<typeof analysisCatalogue>;
export type ModelInfo = Catalogue["items"][number];
export type FitResult = Wire<Awaited<ReturnType<typeof previewAnalysis>>>;
export type SavedRun = Wire<Awaited<ReturnType<typeof runAnalysis>>>;
export type FitParameter = FitResult["parameters"][number];
export type StoredRun = Wire<Awaited<ReturnType<typeof listAnalysesForVersion>>[number]>;
export type PopulationStats = Wire<Awaited<ReturnType<typeof populationStatistics>>>;

/** The part of a stored run's result this UI reads (the service stores describeRun without data and curve). */
export interface StoredResult {
  parameters?: FitParameter[]; chi2red?: number | null; r2?: number | null; converged?: boolean; reason?: string; warnings?: string[];
}

/** An error answer of our API, carrying the server's own message (it names the field). */
export class ApiError extends Error {
  constructor(readonly status: number, message: string) {
    super(message);
    this.name = "ApiError";
  }
}

export async function fetchJson<T>(url: string, init?: RequestInit): Promise<T> {
  const res = await fetch(url, {
    ...init,
    headers: { accept: "application/json", ...(init?.body ? { "content-type": "application/json" } : {}), ...init?.headers },
  });
  const text = await res.text();
  if (!res.ok) {
    let message = `The server answered ${res.status}.`;
    try {
      const body = JSON.parse(text) as { error?: { message?: string } };
      if (body.error?.message) message = body.error.message;
    } catch { /* not JSON */ }
    throw new ApiError(res.status, message);
  }
  return JSON.parse(text) as T;
}

export const postJson = <T>(url: string, body: unknown) => fetchJson<T>(url, { method: "POST", body: JSON.stringify(body) });
