import "server-only";
import { createHash } from "node:crypto";
import fs from "node:fs";
import fsp from "node:fs/promises";
import type { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import {
  CopyObjectCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
} from "@aws-sdk/client-s3";
import type { Env } from "@/lib/env";
import { removeTemp, tempPath } from "./blob-store";
import { BlobMissingError, assertCacheName, blobKey, type BlobInfo, type BlobStore } from "./blob-contract";
import { checkedTemp } from "./local-store";

type S3Settings = Extract<Env["storage"], { kind: "s3" }>;

const KEY = /^([0-9a-f]{2})\/([0-9a-f]{2})\/([0-9a-f]{64})$/;

function isNotFound(err: unknown): boolean {
  const e = err as { name?: string; $metadata?: { httpStatusCode?: number } };
  return e?.name === "NotFound" || e?.name === "NoSuchKey" || e?.$metadata?.httpStatusCode === 404;
}

/**
 * Objects in one S3-compatible bucket under the keys `ab/cd/<sha256>` (the on-disk layout), so any
 * number of instances share the files. Objects are written once and never changed; a put of a hash
 * already there only refreshes its last-modified time (a copy onto itself), never its bytes.
 */
export class S3BlobStore implements BlobStore {
  readonly kind = "s3" as const;
  private readonly client: S3Client;
  private readonly bucket: string;

  constructor(settings: S3Settings) {
    this.bucket = settings.bucket;
    this.client = new S3Client({
      endpoint: settings.endpoint,
      region: settings.region,
      forcePathStyle: settings.forcePathStyle,
      credentials: { accessKeyId: settings.accessKeyId, secretAccessKey: settings.secretAccessKey },
      // Checksums the SDK would add by default are not understood by every S3-compatible server.
      requestChecksumCalculation: "WHEN_REQUIRED",
      responseChecksumValidation: "WHEN_REQUIRED",
    });
  }

  async putFile(tmp: string, sha256: string): Promise<{ created: boolean }> {
    const Key = blobKey(sha256);
    try {
      if (await this.stat(sha256)) {
        await this.client.send(
          new CopyObjectCommand({
            Bucket: this.bucket,
            Key,
            CopySource: `${this.bucket}/${Key}`,
            MetadataDirective: "REPLACE",
            ContentType: "application/octet-stream",
          }),
        );
        return { created: false };
      }
      const { size } = await fsp.stat(tmp);
      // Two instances putting the same hash at once write the same bytes to the same key: still one object.
      await this.client.send(
        new PutObjectCommand({ Bucket: this.bucket, Key, Body: fs.createReadStream(tmp), ContentLength: size, ContentType: "application/octet-stream" }),
      );
      return { created: true };
    } finally {
      await removeTemp(tmp);
    }
  }

  async putStream(source: AsyncIterable<Uint8Array> | Iterable<Uint8Array>, sha256: string): Promise<{ created: boolean }> {
    return this.putFile(await checkedTemp(source, sha256), sha256);
  }

  private async get(sha256: string) {
    try {
      const out = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: blobKey(sha256) }));
      if (!out.Body) throw new BlobMissingError(sha256);
      return out.Body;
    } catch (err) {
      if (isNotFound(err)) throw new BlobMissingError(sha256);
      throw err;
    }
  }

  async openRead(sha256: string): Promise<Readable> {
    return (await this.get(sha256)) as Readable;
  }

  async readAll(sha256: string): Promise<Uint8Array> {
    return (await this.get(sha256)).transformToByteArray();
  }

  async stat(sha256: string): Promise<BlobInfo | null> {
    try {
      const out = await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: blobKey(sha256) }));
      return { sha256, size: out.ContentLength ?? 0, lastModified: out.LastModified ?? new Date(0) };
    } catch (err) {
      if (isNotFound(err)) return null;
      throw err;
    }
  }

  async exists(sha256: string): Promise<boolean> {
    return (await this.stat(sha256)) !== null;
  }

  /** Every key of the bucket in the `ab/cd/<sha256>` layout, a page (1,000 keys) at a time. */
  async *list(): AsyncIterable<BlobInfo> {
    let ContinuationToken: string | undefined;
    do {
      const page = await this.client.send(new ListObjectsV2Command({ Bucket: this.bucket, ContinuationToken }));
      for (const o of page.Contents ?? []) {
        const m = KEY.exec(o.Key ?? "");
        if (!m || !m[3].startsWith(m[1] + m[2])) continue;
        yield { sha256: m[3], size: o.Size ?? 0, lastModified: o.LastModified ?? new Date(0) };
      }
      ContinuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (ContinuationToken);
  }

  async delete(sha256: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: blobKey(sha256) }));
  }

  /** Downloads to a temporary file under uploads/tmp, hashing on the way: a damaged object is refused, not used. */
  async withLocalFile<T>(sha256: string, work: (file: string) => Promise<T>): Promise<T> {
    const tmp = tempPath();
    try {
      const body = await this.openRead(sha256);
      const hash = createHash("sha256");
      await pipeline(
        body,
        async function* (source: AsyncIterable<Buffer>) {
          for await (const chunk of source) {
            hash.update(chunk);
            yield chunk;
          }
        },
        fs.createWriteStream(tmp, { flags: "wx" }),
      );
      const got = hash.digest("hex");
      if (got !== sha256) throw new Error(`the stored object ${sha256} hashes to ${got}: the store is damaged`);
      return await work(tmp);
    } finally {
      await removeTemp(tmp);
    }
  }

  async putCache(name: string, tmp: string): Promise<void> {
    assertCacheName(name);
    try {
      const { size } = await fsp.stat(tmp);
      await this.client.send(
        new PutObjectCommand({
          Bucket: this.bucket,
          Key: `cache/${name}`,
          Body: fs.createReadStream(tmp),
          ContentLength: size,
          ContentType: "application/octet-stream",
        }),
      );
    } finally {
      await removeTemp(tmp);
    }
  }

  async readCache(name: string): Promise<Uint8Array | null> {
    assertCacheName(name);
    try {
      const out = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: `cache/${name}` }));
      return out.Body ? await out.Body.transformToByteArray() : null;
    } catch (err) {
      if (isNotFound(err)) return null;
      throw err;
    }
  }
}
