import type { getDataset, listDatasets } from "@/lib/server/datasets/read-datasets";
import type { VersionDto } from "@/lib/server/datasets/version-dto";

/** What JSON makes of a server type: dates arrive as strings (server components still pass Dates). */
export type Wire<T> = T extends Date ? Date | string
  : T extends Array<infer U> ? Array<Wire<U>>
  : T extends object ? { [K in keyof T]: Wire<T[K]> }
  : T;

export type DatasetListItem = Wire<Awaited<ReturnType<typeof listDatasets>>[number]>;
export type DatasetDetail = Wire<Awaited<ReturnType<typeof getDataset>>>;
export type VersionView = Wire<VersionDto>;

export interface RowsPage {
  versionId: string; offset: number; limit: number; rowCount: number;
  columns: Array<{ name: string; unit: string | null; type: "number" | "string" }>;
  names: string[]; rows: Array<Array<number | string | null>>;
}

export interface PlotData {
  x: { name: string; unit: string | null }; y: { name: string; unit: string | null };
  rowCount: number; downsampled: boolean; points: { x: Array<number | null>; y: Array<number | null> };
}

/** An error answer of our API, carrying the server's own message (it names file, line and column). */
export class ApiError extends Error {
  constructor(readonly status: number, message: string) {
    super(message);
    this.name = "ApiError";
  }
}

export function messageFromBody(status: number, text: string): string {
  try {
    const body = JSON.parse(text) as { error?: { message?: string } };
    if (body.error?.message) return body.error.message;
  } catch { /* not JSON */ }
  return `The server answered ${status}.`;
}

export async function fetchJson<T>(url: string, init?: RequestInit): Promise<T> {
  const res = await fetch(url, { ...init, headers: { accept: "application/json", ...(init?.body ? { "content-type": "application/json" } : {}), ...init?.headers } });
  const text = await res.text();
  if (!res.ok) throw new ApiError(res.status, messageFromBody(res.status, text));
  return JSON.parse(text) as T;
}
