import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasets, versions } from "@/db/schema";
import { decodeColumnar } from "@/lib/data/columnar";
import type { ParsedTable } from "@/lib/data/parse";
import { badRequest, notFound } from "@/lib/errors";
import { columnsFor } from "../datasets/columns-cache";
import type { FitOptions } from "./schemas";

export interface FitData {
  version: typeof versions.$inferSelect;
  dataset: typeof datasets.$inferSelect;
  x: Float64Array;
  y: Float64Array;
  sigma?: Float64Array;
  xUnit: string | null;
  yUnit: string | null;
  dropped: number;
  /** Points with x and y but outside options.xRange, for drawing faded beside the fitted ones. */
  outside?: { x: number[]; y: number[] };
}

/** The x, y (and σ) columns of a version, rows with a missing value or outside xRange left out. */
export async function loadFitData(versionId: string, options: FitOptions): Promise<FitData> {
  const [row] = await getDb()
    .select({ v: versions, d: datasets })
    .from(versions)
    .innerJoin(datasets, eq(datasets.id, versions.datasetId))
    .where(eq(versions.id, versionId));
  if (!row) throw notFound();
  const table = decodeColumnar(await columnsFor(row.v.sha256, row.v.fileName));
  return { version: row.v, dataset: row.d, ...fitColumns(table, options, row.v.number) };
}

/** The fitted columns of a parsed table: x, y (and σ) as numbers, rows with a missing value, σ ≤ 0 or x outside xRange left out. */
export function fitColumns(table: Pick<ParsedTable, "columns" | "data">, options: FitOptions, versionNumber: number): Omit<FitData, "version" | "dataset"> {
  const numeric = table.columns.filter((c) => c.type === "number").map((c) => c.name);
  const column = (name: string, field: string) => {
    const i = table.columns.findIndex((c) => c.name === name);
    if (i < 0 || table.columns[i].type !== "number")
      throw badRequest(`options.${field}: no numeric column named "${name}" in version ${versionNumber} (numeric columns: ${numeric.join(", ")}).`);
    return { data: table.data[i] as Float64Array, unit: table.columns[i].unit };
  };
  const xs = column(options.x, "x");
  const ys = column(options.y, "y");
  const ss = options.sigma ? column(options.sigma, "sigma") : null;
  const [lo, hi] = options.xRange ?? [-Infinity, Infinity];
  const keep: number[] = [];
  const outside = { x: [] as number[], y: [] as number[] };
  for (let i = 0; i < xs.data.length; i++) {
    const ok = Number.isFinite(xs.data[i]) && Number.isFinite(ys.data[i]) && (!ss || (ss.data[i] > 0 && Number.isFinite(ss.data[i])));
    const inside = xs.data[i] >= lo && xs.data[i] <= hi;
    if (ok && inside) keep.push(i);
    else if (!inside && Number.isFinite(xs.data[i]) && Number.isFinite(ys.data[i])) {
      outside.x.push(xs.data[i]);
      outside.y.push(ys.data[i]);
    }
  }
  if (options.xRange && keep.length === 0)
    throw badRequest(`options.xRange: no usable point of version ${versionNumber} has ${options.x} between ${lo} and ${hi}.`);
  const pick = (a: Float64Array) => Float64Array.from(keep, (i) => a[i]);
  return {
    x: pick(xs.data),
    y: pick(ys.data),
    sigma: ss ? pick(ss.data) : undefined,
    xUnit: xs.unit,
    yUnit: ys.unit,
    dropped: xs.data.length - keep.length,
    ...(options.xRange ? { outside } : {}),
  };
}
