// One contract for both stores: the same checks run against the uploads folder (STORAGE=local) and
// against an S3-compatible bucket on a local fake S3 server (s3rver) that this file starts.
// Expected hashes are independent of the code under test (Python's hashlib):
//   python3 -c "import hashlib; print(hashlib.sha256(b'hello\n').hexdigest())"
import { createHash, randomBytes } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { env, resetEnvForTests } from "@/lib/env";
import { BlobMissingError, type BlobInfo, type BlobStore } from "@/lib/server/storage/blob-contract";
import { tempPath } from "@/lib/server/storage/blob-store";
import { copyBlobs } from "@/lib/server/storage/copy-blobs";
import { LocalBlobStore } from "@/lib/server/storage/local-store";
import { blobStore } from "@/lib/server/storage/store";
import { startFakeS3, type FakeS3 } from "../support/fake-s3";

const HELLO = { bytes: new TextEncoder().encode("hello\n"), sha256: "5891b5b522d5df086d0ff0b110fbd9d21bb4fc7163af34d08286a2e846f6be03" };
const ONCE = { bytes: new TextEncoder().encode("Prooflight stores this once.\n"), sha256: "74adfee43b6fc9299de7c49f707ea023f11383cb9dffb7beb3064b4fb5b7f838" };

const STORAGE_KEYS = ["STORAGE", "S3_ENDPOINT", "S3_REGION", "S3_BUCKET", "S3_ACCESS_KEY_ID", "S3_SECRET_ACCESS_KEY", "S3_FORCE_PATH_STYLE", "UPLOADS_DIR"];
const saved = Object.fromEntries(STORAGE_KEYS.map((k) => [k, process.env[k]]));
function restoreEnv() {
  for (const [k, v] of Object.entries(saved)) {
    if (v === undefined) delete process.env[k];
    else process.env[k] = v;
  }
  resetEnvForTests();
}

async function collect(list: AsyncIterable<BlobInfo>): Promise<BlobInfo[]> {
  const out: BlobInfo[] = [];
  for await (const b of list) out.push(b);
  return out.sort((a, b) => a.sha256.localeCompare(b.sha256));
}

async function streamBytes(stream: AsyncIterable<Buffer>): Promise<Uint8Array> {
  const chunks: Buffer[] = [];
  for await (const c of stream) chunks.push(c);
  return new Uint8Array(Buffer.concat(chunks));
}

function partFiles(): string[] {
  const dir = path.join(env().uploadsDir, "tmp");
  return fs.existsSync(dir) ? fs.readdirSync(dir) : [];
}

interface Kind {
  name: "local" | "s3";
  setUp(dir: string): Promise<void>;
  /** Something in the same folder or bucket that is not a stored file: list must pass over it. */
  addForeign(): Promise<void>;
  tearDown(): Promise<void>;
}

let fake: FakeS3 | undefined;
const kinds: Kind[] = [
  {
    name: "local",
    async setUp(dir) {
      process.env.UPLOADS_DIR = path.join(dir, "uploads");
      process.env.STORAGE = "local";
    },
    async addForeign() {
      const up = env().uploadsDir;
      fs.mkdirSync(path.join(up, "cache"), { recursive: true });
      fs.writeFileSync(path.join(up, "cache", `${HELLO.sha256}.columns`), "derived");
      fs.mkdirSync(path.join(up, "ab", "cd"), { recursive: true });
      fs.writeFileSync(path.join(up, "ab", "cd", "notes.txt"), "not a hash");
    },
    async tearDown() {},
  },
  {
    name: "s3",
    async setUp(dir) {
      process.env.UPLOADS_DIR = path.join(dir, "uploads");
      fake = await startFakeS3();
      Object.assign(process.env, fake.env);
    },
    async addForeign() {
      const s = env().storage;
      if (s.kind !== "s3") throw new Error("not on S3");
      const client = new S3Client({
        endpoint: s.endpoint,
        region: s.region,
        forcePathStyle: true,
        credentials: { accessKeyId: s.accessKeyId, secretAccessKey: s.secretAccessKey },
      });
      await client.send(new PutObjectCommand({ Bucket: s.bucket, Key: "notes/readme.txt", Body: "not a hash" }));
      await client.send(new PutObjectCommand({ Bucket: s.bucket, Key: `58/91/${"0".repeat(64)}`, Body: "wrong folder for its name" }));
      client.destroy();
    },
    async tearDown() {
      await fake?.close();
    },
  },
];

describe.each(kinds)("BlobStore contract: $name", (kind) => {
  let dir: string;
  let store: BlobStore;
  beforeAll(async () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), `prooflight-store-${kind.name}-`));
    await kind.setUp(dir);
    resetEnvForTests();
    store = blobStore();
  });
  afterAll(async () => {
    await kind.tearDown();
    restoreEnv();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it("is the implementation STORAGE names", () => {
    expect(store.kind).toBe(kind.name);
  });

  it("stores a stream under its hash and gives the same bytes back by stream, whole and as a local file", async () => {
    expect(await store.putStream([HELLO.bytes], HELLO.sha256)).toEqual({ created: true });
    expect(await store.exists(HELLO.sha256)).toBe(true);
    const info = await store.stat(HELLO.sha256);
    expect(info).toMatchObject({ sha256: HELLO.sha256, size: 6 });
    expect(info!.lastModified).toBeInstanceOf(Date);
    expect(await store.readAll(HELLO.sha256)).toEqual(HELLO.bytes);
    expect(await streamBytes(await store.openRead(HELLO.sha256))).toEqual(HELLO.bytes);
    let seen = "";
    const result = await store.withLocalFile(HELLO.sha256, async (file) => {
      seen = file;
      return fs.readFileSync(file, "utf8");
    });
    expect(result).toBe("hello\n");
    // On disk the stored file itself is lent (and stays); from object storage a temporary copy, removed afterwards.
    expect(fs.existsSync(seen)).toBe(kind.name === "local");
    expect(partFiles()).toEqual([]);
  });

  it("stores a complete temporary file and removes the temporary copy", async () => {
    const tmp = tempPath();
    fs.writeFileSync(tmp, ONCE.bytes);
    expect(await store.putFile(tmp, ONCE.sha256)).toEqual({ created: true });
    expect(fs.existsSync(tmp)).toBe(false);
    expect(await store.readAll(ONCE.sha256)).toEqual(ONCE.bytes);
  });

  it("keeps one copy when the same bytes are put again, one after the other or at the same moment", async () => {
    expect(await store.putStream([HELLO.bytes], HELLO.sha256)).toEqual({ created: false });
    // In a bucket the time is refreshed by copying the object onto itself (its bytes are not sent again).
    if (kind.name === "s3")
      expect(fake!.writes.filter((w) => w.key.endsWith(HELLO.sha256)).map((w) => w.event)).toEqual(["ObjectCreated:Put", "ObjectCreated:Copy"]);
    const again = await Promise.all([store.putStream([ONCE.bytes], ONCE.sha256), store.putStream([ONCE.bytes], ONCE.sha256)]);
    expect(again.every((r) => r.created === false)).toBe(true);
    expect((await collect(store.list())).map((b) => [b.sha256, b.size])).toEqual([
      [HELLO.sha256, 6],
      [ONCE.sha256, 29],
    ]);
    expect(partFiles()).toEqual([]);
  });

  it("refuses bytes that do not match the hash given, storing nothing", async () => {
    const wrong = "f".repeat(64);
    await expect(store.putStream([new TextEncoder().encode("hello\n")], wrong)).rejects.toThrow(
      `the bytes hash to ${HELLO.sha256}, not ${wrong}: nothing was stored`,
    );
    expect(await store.exists(wrong)).toBe(false);
    expect(partFiles()).toEqual([]);
  });

  it("says a file is missing: BlobMissingError from the readers, null from stat", async () => {
    const absent = "0".repeat(64);
    expect(await store.stat(absent)).toBeNull();
    expect(await store.exists(absent)).toBe(false);
    await expect(store.openRead(absent)).rejects.toBeInstanceOf(BlobMissingError);
    await expect(store.readAll(absent)).rejects.toBeInstanceOf(BlobMissingError);
    await expect(store.withLocalFile(absent, async () => "never")).rejects.toBeInstanceOf(BlobMissingError);
    expect(partFiles()).toEqual([]);
  });

  it("refuses a name that is not a SHA-256 before touching the store", async () => {
    await expect(store.stat("../../etc/passwd")).rejects.toThrow("not a sha256");
    await expect(store.putStream([HELLO.bytes], "ABC")).rejects.toThrow("not a sha256");
  });

  it("lists only stored files, with size and last-modified time, passing over anything else", async () => {
    await kind.addForeign();
    const listed = await collect(store.list());
    expect(listed.map((b) => b.sha256)).toEqual([HELLO.sha256, ONCE.sha256]);
    for (const b of listed) expect(b.lastModified.getTime()).toBeGreaterThan(0);
  });

  it("streams a 3 MB file through unchanged", async () => {
    const bytes = new Uint8Array(randomBytes(3 * 1024 * 1024));
    const sha256 = createHash("sha256").update(bytes).digest("hex");
    // Three chunks, as an upload arrives.
    const third = bytes.length / 3;
    await store.putStream([bytes.subarray(0, third), bytes.subarray(third, 2 * third), bytes.subarray(2 * third)], sha256);
    const back = await streamBytes(await store.openRead(sha256));
    expect(createHash("sha256").update(back).digest("hex")).toBe(sha256);
    expect((await store.stat(sha256))!.size).toBe(3 * 1024 * 1024);
    await store.delete(sha256);
  });

  it("keeps derived files by name, apart from the stored files", async () => {
    expect(await store.readCache("thumbs/figure-abc.png")).toBeNull();
    const tmp = tempPath();
    fs.writeFileSync(tmp, "a picture");
    await store.putCache("thumbs/figure-abc.png", tmp);
    expect(fs.existsSync(tmp)).toBe(false);
    expect(new TextDecoder().decode((await store.readCache("thumbs/figure-abc.png"))!)).toBe("a picture");
    // On disk exactly where the thumbnails and column caches have always been.
    expect(fs.existsSync(path.join(env().uploadsDir, "cache", "thumbs", "figure-abc.png"))).toBe(kind.name === "local");
    expect((await collect(store.list())).map((b) => b.sha256)).toEqual([HELLO.sha256, ONCE.sha256]);
    await expect(store.readCache("../secrets")).rejects.toThrow("not a cache name: ../secrets");
    await expect(store.readCache("/etc/passwd")).rejects.toThrow("not a cache name");
    expect(partFiles()).toEqual([]);
  });

  it("deletes one file; deleting it again is not an error", async () => {
    await store.delete(HELLO.sha256);
    expect(await store.exists(HELLO.sha256)).toBe(false);
    await store.delete(HELLO.sha256);
    expect((await collect(store.list())).map((b) => b.sha256)).toEqual([ONCE.sha256]);
  });
});

describe("the local store keeps the layout existing installs have", () => {
  let dir: string;
  beforeAll(() => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-store-layout-"));
    process.env.UPLOADS_DIR = path.join(dir, "uploads");
    process.env.STORAGE = "local";
    resetEnvForTests();
  });
  afterAll(() => {
    restoreEnv();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it("reads a file placed at uploads/ab/cd/<sha256> before the store existed, and writes there read-only", async () => {
    const old = path.join(dir, "uploads", "74", "ad", ONCE.sha256);
    fs.mkdirSync(path.dirname(old), { recursive: true });
    fs.writeFileSync(old, ONCE.bytes);
    expect(await blobStore().readAll(ONCE.sha256)).toEqual(ONCE.bytes);
    await blobStore().putStream([HELLO.bytes], HELLO.sha256);
    const written = path.join(dir, "uploads", "58", "91", HELLO.sha256);
    expect(fs.readFileSync(written, "utf8")).toBe("hello\n");
    expect(fs.statSync(written).mode & 0o777).toBe(0o444);
  });

  it("refreshes the time of a file put again, so a sweep's grace period counts from the last upload of those bytes", async () => {
    const written = path.join(dir, "uploads", "58", "91", HELLO.sha256);
    const longAgo = new Date("2020-01-01T00:00:00Z");
    fs.utimesSync(written, longAgo, longAgo);
    expect((await blobStore().stat(HELLO.sha256))!.lastModified).toEqual(longAgo);
    expect(await blobStore().putStream([HELLO.bytes], HELLO.sha256)).toEqual({ created: false });
    expect((await blobStore().stat(HELLO.sha256))!.lastModified.getTime()).toBeGreaterThan(longAgo.getTime());
  });
});

describe("storage settings", () => {
  afterAll(restoreEnv);
  const load = (vars: Record<string, string>) => {
    for (const k of STORAGE_KEYS.filter((k) => k !== "UPLOADS_DIR")) delete process.env[k];
    Object.assign(process.env, vars);
    resetEnvForTests();
    return () => env();
  };

  it("defaults to the uploads folder", () => {
    expect(load({})().storage).toEqual({ kind: "local" });
  });

  it("names every missing S3 setting when STORAGE=s3", () => {
    expect(load({ STORAGE: "s3" })).toThrow(
      "Invalid environment: S3_BUCKET: required when STORAGE=s3; S3_ACCESS_KEY_ID: required when STORAGE=s3; S3_SECRET_ACCESS_KEY: required when STORAGE=s3",
    );
  });

  it("refuses an unknown STORAGE, a bucket name S3 would refuse, an endpoint that is not a URL and a path style that is not a yes or no", () => {
    expect(load({ STORAGE: "cloud" })).toThrow("STORAGE: STORAGE must be local or s3");
    expect(load({ STORAGE: "s3", S3_BUCKET: "My_Bucket", S3_ACCESS_KEY_ID: "a", S3_SECRET_ACCESS_KEY: "b" })).toThrow(
      "S3_BUCKET: S3_BUCKET must be a bucket name: 3 to 63 lower-case letters, digits, dots or hyphens",
    );
    expect(load({ STORAGE: "s3", S3_ENDPOINT: "minio.lab:9000", S3_BUCKET: "lab", S3_ACCESS_KEY_ID: "a", S3_SECRET_ACCESS_KEY: "b" })).toThrow(
      "S3_ENDPOINT: S3_ENDPOINT must be a URL such as http://127.0.0.1:9000",
    );
    expect(load({ STORAGE: "s3", S3_FORCE_PATH_STYLE: "yes", S3_BUCKET: "lab", S3_ACCESS_KEY_ID: "a", S3_SECRET_ACCESS_KEY: "b" })).toThrow(
      "S3_FORCE_PATH_STYLE: S3_FORCE_PATH_STYLE must be true or false",
    );
  });

  it("reads a complete S3 configuration", () => {
    const s = load({
      STORAGE: "s3",
      S3_ENDPOINT: "http://127.0.0.1:9000",
      S3_REGION: "eu-north-1",
      S3_BUCKET: "lab-files",
      S3_ACCESS_KEY_ID: "key",
      S3_SECRET_ACCESS_KEY: "secret",
      S3_FORCE_PATH_STYLE: "1",
    })().storage;
    expect(s).toEqual({
      kind: "s3",
      endpoint: "http://127.0.0.1:9000",
      region: "eu-north-1",
      bucket: "lab-files",
      accessKeyId: "key",
      secretAccessKey: "secret",
      forcePathStyle: true,
    });
  });
});

describe("moving an uploads folder into a bucket (npm run storage:copy)", () => {
  let dir: string;
  let bucket: FakeS3;
  beforeAll(async () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-store-copy-"));
    process.env.UPLOADS_DIR = path.join(dir, "uploads");
    bucket = await startFakeS3("prooflight-copy");
    Object.assign(process.env, bucket.env);
    resetEnvForTests();
  });
  afterAll(async () => {
    await bucket.close();
    restoreEnv();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it("copies every stored file once, re-hashed, and refuses a damaged one", async () => {
    const from = new LocalBlobStore(path.join(dir, "old-uploads"));
    await from.putStream([HELLO.bytes], HELLO.sha256);
    await from.putStream([ONCE.bytes], ONCE.sha256);
    // A file whose bytes no longer match its name (the name is the SHA-256 of "bye\n", from hashlib).
    const damaged = "abc6fd595fc079d3114d4b71a4d84b1d1d0f79df1e70f8813212f2a65d8916df";
    fs.mkdirSync(path.join(dir, "old-uploads", "ab", "c6"), { recursive: true });
    fs.writeFileSync(path.join(dir, "old-uploads", "ab", "c6", damaged), "not bye\n");
    const to = blobStore();
    expect(to.kind).toBe("s3");
    const first = await copyBlobs(from, to);
    expect(first).toMatchObject({ copied: 2, present: 0 });
    expect(first.failed.map((f) => f.sha256)).toEqual([damaged]);
    expect(first.failed[0]!.reason).toMatch(/nothing was stored$/);
    expect(await to.readAll(HELLO.sha256)).toEqual(HELLO.bytes);
    expect(await to.exists(damaged)).toBe(false);
    const again = await copyBlobs(from, to);
    expect(again).toMatchObject({ copied: 0, present: 2 });
  });
});
