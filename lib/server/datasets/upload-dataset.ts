import "server-only";
import { and, desc, eq, max } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasets, versions } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";
import { env } from "@/lib/env";
import { appendAudit } from "../audit";
import { newId } from "../crypto";
import { badRequest, notFound } from "@/lib/errors";
import { consumeRate, type RateRule } from "../limits/rate-limit";
import { removeTemp, tempPath, writeStreamToTemp } from "../storage/blob-store";
import { blobStore } from "../storage/store";
import { readMultipartUpload, type UploadedFile } from "../storage/multipart";
import { acquireUploadSlot } from "../storage/upload-slots";
import { metadataInput, uploadFields, type MetadataInput, type UploadFields } from "./schemas";
import { columnsCacheName } from "./columns-cache";
import { ingestInChild, type IngestedTable } from "./ingest-in-child";
import { toVersionDto } from "./version-dto";

function parseMetadata(raw: string | undefined): MetadataInput {
  if (!raw) return {};
  let json: unknown;
  try {
    json = JSON.parse(raw);
  } catch (e) {
    throw badRequest(`metadata: not valid JSON (${(e as Error).message}).`);
  }
  const r = metadataInput.safeParse(json);
  if (!r.success) throw badRequest(`metadata: ${r.error.issues.map((i) => `${i.path.join(".") || "(object)"}: ${i.message}`).join("; ")}`);
  return r.data;
}

/** Uploads a user may start per hour (attempts count, refused ones too). */
const UPLOADS_PER_HOUR = 120;
const uploadRate = (userId: string): RateRule => ({
  bucket: `upload:user:${userId}`,
  max: UPLOADS_PER_HOUR,
  windowMs: 3600_000,
  message: `You have started ${UPLOADS_PER_HOUR} uploads in the last hour.`,
});

/**
 * The fields checked before anything is stored: the zod shape, the metadata JSON, and that a
 * `datasetId` names a dataset of this manuscript (a refused upload must leave no file behind).
 */
async function checkFields(manuscriptId: string, fields: Record<string, string>): Promise<{ f: UploadFields; metadata: MetadataInput }> {
  const f = uploadFields.parse(fields);
  const metadata = parseMetadata(f.metadata);
  if (f.datasetId) {
    const [ds] = await getDb()
      .select({ id: datasets.id })
      .from(datasets)
      .where(and(eq(datasets.id, f.datasetId), eq(datasets.manuscriptId, manuscriptId)));
    if (!ds) throw notFound("datasetId: no such dataset in this manuscript.");
  }
  return { f, metadata };
}

/**
 * Upload slot (per user and in total, 429) → hourly rate (429) → fields sent before the file checked
 * before the file is read → temporary file (hashed while streaming) → all fields checked → parse,
 * summaries and columnar cache in the budgeted ingest child (exact errors, nothing stored on
 * failure; the file never enters this process's memory) → atomic renames of the file under its hash
 * and of the cache → one transaction for the rows and the audit entry. The slot is held until the
 * upload is stored or refused.
 */
export async function uploadDataset(user: SessionUser, manuscriptId: string, req: Request) {
  const release = acquireUploadSlot(user.id);
  try {
    await consumeRate([uploadRate(user.id)]);
    const { fields, file } = await readMultipartUpload(req, env().uploadMaxBytes, {
      beforeFile: async (early) => {
        await checkFields(manuscriptId, early);
      },
    });
    if (!file) throw badRequest("file: the multipart body has no `file` part.");
    return await ingestFile(user, manuscriptId, file, fields);
  } finally {
    release();
  }
}

/** Stores bytes that are already in memory (seed, scripts) through the same path as an upload. */
/** More writes that must commit with the version, or not at all (a fit run and its derived version). */
type AlsoInTransaction = (tx: Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0], version: { id: string }) => Promise<void>;

export async function importDatasetFromBytes(
  user: SessionUser,
  manuscriptId: string,
  fileName: string,
  bytes: Uint8Array,
  fields: Record<string, string>,
  alsoInTransaction?: AlsoInTransaction,
) {
  const stored = await writeStreamToTemp([bytes], env().uploadMaxBytes);
  return ingestFile(user, manuscriptId, { ...stored, fileName }, fields, alsoInTransaction);
}

async function ingestFile(user: SessionUser, manuscriptId: string, file: UploadedFile, fields: Record<string, string>, alsoInTransaction?: AlsoInTransaction) {
  const cacheTmp = tempPath();
  try {
    // Before the blob is committed or the cache written: fields may also come after the file part.
    const { f, metadata } = await checkFields(manuscriptId, fields);
    const delimiter = f.delimiter === "tab" ? "\t" : f.delimiter;
    const table = await ingestInChild({
      input: file.tmp,
      output: cacheTmp,
      fileName: file.fileName,
      options: { delimiter, decimal: f.decimal, format: f.format },
    });
    await blobStore().putFile(file.tmp, file.sha256);
    // Not read into memory here: a large upload would otherwise stay resident until evicted; the first read loads it.
    await blobStore().putCache(columnsCacheName(file.sha256), cacheTmp);
    return await recordVersion(user, manuscriptId, file, table, f.datasetId, f.name, metadata, alsoInTransaction);
  } finally {
    await removeTemp(file.tmp);
    await removeTemp(cacheTmp);
  }
}

async function recordVersion(
  user: SessionUser,
  manuscriptId: string,
  file: UploadedFile,
  table: IngestedTable,
  datasetId: string | undefined,
  name: string | undefined,
  metadata: MetadataInput,
  alsoInTransaction?: AlsoInTransaction,
) {
  return getDb().transaction(async (tx) => {
    let dsId = datasetId;
    if (dsId) {
      const [ds] = await tx
        .select({ id: datasets.id })
        .from(datasets)
        .where(and(eq(datasets.id, dsId), eq(datasets.manuscriptId, manuscriptId)));
      if (!ds) throw notFound("datasetId: no such dataset in this manuscript.");
      const [latest] = await tx.select().from(versions).where(eq(versions.datasetId, dsId)).orderBy(desc(versions.number)).limit(1);
      if (latest?.sha256 === file.sha256) {
        await alsoInTransaction?.(tx, latest);
        return { ...toVersionDto(latest), deduplicated: true };
      }
    } else {
      dsId = newId();
      await tx.insert(datasets).values({
        id: dsId,
        manuscriptId,
        name: name ?? file.fileName,
        createdBy: user.id,
        kind: metadata.kind ?? "other",
        sample: metadata.sample ?? null,
        instrument: metadata.instrument ?? null,
        measuredAt: metadata.measuredAt ?? null,
        notes: metadata.notes ?? null,
        tags: metadata.tags ?? {},
      });
    }
    const [{ n } = { n: 0 }] = await tx
      .select({ n: max(versions.number) })
      .from(versions)
      .where(eq(versions.datasetId, dsId));
    const [row] = await tx
      .insert(versions)
      .values({
        id: newId(),
        datasetId: dsId,
        number: (n ?? 0) + 1,
        sha256: file.sha256,
        byteSize: file.byteSize,
        fileName: file.fileName,
        rowCount: table.rowCount,
        columns: table.columns,
        parseInfo: table.parseInfo,
        summary: table.summary,
        createdBy: user.id,
      })
      .returning();
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId,
      action: "dataset.upload",
      target: `version:${row.id}`,
      data: { datasetId: dsId, number: row.number, sha256: file.sha256, fileName: file.fileName, byteSize: file.byteSize },
    });
    await alsoInTransaction?.(tx, row);
    return { ...toVersionDto(row), deduplicated: false };
  });
}
