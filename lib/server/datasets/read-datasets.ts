import "server-only";
import { Readable } from "node:stream";
import { and, asc, desc, eq, inArray, isNotNull, isNull, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { datasets, users, versions } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { decodeColumnar, readRows } from "@/lib/data/columnar";
import { minMaxPerBucket } from "@/lib/data/downsample";
import { appendAudit } from "../audit";
import { badRequest, notFound } from "@/lib/errors";
import { BlobMissingError } from "../storage/blob-contract";
import { blobStore } from "../storage/store";
import { columnsFor } from "./columns-cache";
import { metadataInput, type MetadataInput } from "./schemas";
import { manuscriptOfDataset, manuscriptOfVersion } from "./scope";
import { toVersionDto } from "./version-dto";
import { contentDisposition } from "../storage/file-name";

/** The manuscript's datasets for lists and pickers: archived ones left out, or only those when `archived`. */
export async function listDatasets(user: SessionUser, manuscriptId: string, archived = false) {
  await authorize(user, "manuscript.read", manuscriptId);
  const rows = await getDb()
    .select()
    .from(datasets)
    .where(and(eq(datasets.manuscriptId, manuscriptId), archived ? isNotNull(datasets.archivedAt) : isNull(datasets.archivedAt)))
    .orderBy(asc(datasets.name));
  const ids = rows.map((d) => d.id);
  const vs = ids.length ? await getDb().select().from(versions).where(inArray(versions.datasetId, ids)).orderBy(desc(versions.number)) : [];
  const latest = new Map<string, (typeof vs)[number]>();
  const counts = new Map<string, number>();
  for (const v of vs) {
    if (!latest.has(v.datasetId)) latest.set(v.datasetId, v);
    counts.set(v.datasetId, (counts.get(v.datasetId) ?? 0) + 1);
  }
  return rows.map((d) => ({ ...d, versionCount: counts.get(d.id) ?? 0, latestVersion: latest.has(d.id) ? toVersionDto(latest.get(d.id)!) : null }));
}

export async function getDataset(user: SessionUser, datasetId: string) {
  const manuscriptId = await manuscriptOfDataset(datasetId);
  const role = await authorize(user, "manuscript.read", manuscriptId);
  const [d] = await getDb().select().from(datasets).where(eq(datasets.id, datasetId));
  const vs = await getDb()
    .select({ v: versions, by: users.name })
    .from(versions)
    .innerJoin(users, eq(users.id, versions.createdBy))
    .where(eq(versions.datasetId, datasetId))
    .orderBy(desc(versions.number));
  return { ...d, role, versions: vs.map(({ v, by }) => ({ ...toVersionDto(v), createdByName: by })) };
}

export async function updateDatasetMetadata(user: SessionUser, datasetId: string, input: MetadataInput) {
  const manuscriptId = await manuscriptOfDataset(datasetId);
  await authorize(user, "dataset.edit", manuscriptId);
  const patch = metadataInput.parse(input);
  await getDb().transaction(async (tx) => {
    const [before] = await tx.select().from(datasets).where(eq(datasets.id, datasetId));
    await tx.update(datasets).set(patch).where(eq(datasets.id, datasetId));
    const changed = Object.fromEntries(Object.entries(patch).map(([k, v]) => [k, { from: (before as Record<string, unknown>)[k] ?? null, to: v }]));
    await appendAudit(tx, { actorId: user.id, manuscriptId, action: "dataset.metadata", target: `dataset:${datasetId}`, data: changed });
  });
  return getDataset(user, datasetId);
}

async function loadVersion(user: SessionUser, versionId: string) {
  const manuscriptId = await manuscriptOfVersion(versionId);
  await authorize(user, "manuscript.read", manuscriptId);
  const [v] = await getDb().select().from(versions).where(eq(versions.id, versionId));
  if (!v) throw notFound();
  return { v, manuscriptId };
}

export async function getVersion(user: SessionUser, versionId: string) {
  return toVersionDto((await loadVersion(user, versionId)).v);
}

/** The original bytes, streamed from disk; the stored file name goes into Content-Disposition, safely encoded. */
export async function openRawVersion(user: SessionUser, versionId: string) {
  const { v } = await loadVersion(user, versionId);
  const stored = await blobStore()
    .openRead(v.sha256)
    .catch((err: unknown) => {
      if (err instanceof BlobMissingError) throw notFound("The stored file is missing; restore it from a backup.");
      throw err;
    });
  return {
    body: Readable.toWeb(stored) as ReadableStream<Uint8Array>,
    headers: {
      "content-type": "application/octet-stream",
      "content-length": String(v.byteSize),
      // Cleaned on the way out too: names stored before cleaning existed may hold bidi or control characters.
      "content-disposition": contentDisposition(v.fileName),
      "x-content-sha256": v.sha256,
      "cache-control": "private, max-age=31536000, immutable",
    },
  };
}

const versionFile = preparedQuery((db) =>
  db
    .select({ sha256: versions.sha256, fileName: versions.fileName })
    .from(versions)
    .where(eq(versions.id, sql.placeholder("id")))
    .prepare(),
);

export async function getVersionRows(user: SessionUser, versionId: string, offset: number, limit: number) {
  await authorize(user, "manuscript.read", await manuscriptOfVersion(versionId));
  const v = await versionFile().get({ id: versionId });
  if (!v) throw notFound();
  const page = readRows(await columnsFor(v.sha256, v.fileName), offset, limit);
  const names = page.columns.map((c) => c.name);
  const rows: Array<Array<number | string | null>> = [];
  for (let r = 0; r < page.length; r++) {
    rows.push(
      page.data.map((col) => {
        const value = col[r];
        return typeof value === "number" && !Number.isFinite(value) ? null : value;
      }),
    );
  }
  return {
    versionId,
    offset: page.offset,
    limit,
    rowCount: page.rowCount,
    columns: page.columns.map(({ name, unit, type }) => ({ name, unit, type })),
    names,
    rows,
  };
}

/** Two columns for a quick look, reduced to min/max per pixel column so dips and spikes survive. */
export async function getVersionPlot(user: SessionUser, versionId: string, x: string, y: string, points: number) {
  const { v } = await loadVersion(user, versionId);
  const table = decodeColumnar(await columnsFor(v.sha256, v.fileName));
  const col = (name: string, field: string) => {
    const i = table.columns.findIndex((c) => c.name === name);
    if (i < 0) throw badRequest(`${field}: no column named "${name}" (columns: ${table.columns.map((c) => c.name).join(", ")}).`);
    if (table.columns[i].type !== "number") throw badRequest(`${field}: column "${name}" is not numeric.`);
    return { data: table.data[i] as Float64Array, unit: table.columns[i].unit };
  };
  const xs = col(x, "x");
  const ys = col(y, "y");
  const series =
    table.rowCount <= points
      ? { x: Array.from(xs.data), y: Array.from(ys.data) }
      : isAscending(xs.data)
        ? minMaxPerBucket(xs.data, ys.data, Math.floor(points / 2))
        : stride(xs.data, ys.data, points);
  return { x: { name: x, unit: xs.unit }, y: { name: y, unit: ys.unit }, rowCount: table.rowCount, downsampled: table.rowCount > points, points: series };
}

function isAscending(a: Float64Array): boolean {
  for (let i = 1; i < a.length; i++) if (a[i] < a[i - 1]) return false;
  return true;
}

/** For unordered x (maps, scatter) min/max buckets mean nothing; every k-th point is an honest preview. */
function stride(x: Float64Array, y: Float64Array, points: number) {
  const k = Math.ceil(x.length / points);
  const out = { x: [] as number[], y: [] as number[] };
  for (let i = 0; i < x.length; i += k) {
    out.x.push(x[i]);
    out.y.push(y[i]);
  }
  return out;
}
