// Uploads never hang, never leak a part file or a slot, and never store what was refused.
import fs from "node:fs";
import path from "node:path";
import { afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasets, rateEvents, versions } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID, OTHER_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { resetEnvForTests } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { readMultipartUpload } from "@/lib/server/storage/multipart";
import * as list from "@/app/api/manuscripts/[id]/datasets/route";
import * as dataset from "@/app/api/datasets/[id]/route";
import * as raw from "@/app/api/versions/[id]/raw/route";
import { call, setupTestApp, uploadForm, type Who } from "./harness";

let tokens: Record<Who, string>;
let dir: string;
beforeAll(async () => {
  process.env.UPLOAD_MAX_BYTES = String(256 * 1024);
  ({ tokens, dir } = await setupTestApp());
});
afterEach(() => {
  vi.restoreAllMocks();
});

const KiB = 1024;
const BOUNDARY = "prooflight-test-boundary";
const enc = new TextEncoder();
const params = { id: DEMO_MANUSCRIPT_ID };
const upload = (form: FormData, who: Who = "author") => call(list.POST, { method: "POST", token: tokens[who], params, rawBody: form });

/** Sets variables for one test; the returned function puts the environment back. */
function withEnv(vars: Record<string, string>): () => void {
  Object.assign(process.env, vars);
  resetEnvForTests();
  return () => {
    for (const k of Object.keys(vars)) delete process.env[k];
    resetEnvForTests();
  };
}

const field = (name: string, value: string) => `--${BOUNDARY}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n${value}\r\n`;
const fileHead = (fileName: string) => `--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="${fileName}"\r\nContent-Type: text/csv\r\n\r\n`;
const END = `\r\n--${BOUNDARY}--\r\n`;

/** A whole multipart body: the fields, then the file. */
function body(fileName: string, content: string, fields: Record<string, string> = {}): Uint8Array {
  return enc.encode(
    Object.entries(fields)
      .map(([k, v]) => field(k, v))
      .join("") +
      fileHead(fileName) +
      content +
      END,
  );
}

function split(bytes: Uint8Array, size: number): Uint8Array[] {
  const out: Uint8Array[] = [];
  for (let i = 0; i < bytes.byteLength; i += size) out.push(bytes.subarray(i, i + size));
  return out;
}

/** "x,y\n" then rows until the text is `bytes` long. */
function csv(bytes: number): string {
  const head = "x,y\n";
  return head + "1,2\n".repeat((bytes - head.length) / 4);
}

interface Feed {
  stream: ReadableStream<Uint8Array>;
  pulls: number;
  cancelled: boolean;
  reached: Promise<void>;
}

/**
 * A request body that hands out one chunk per read and counts the reads. At chunk `stopAt` it errors
 * (a client that goes away), stalls for ever, or waits for `gate` and then goes on.
 */
function feed(chunks: Uint8Array[], o: { stopAt?: number; then?: "error" | "stall"; gate?: Promise<void>; onStop?: () => void } = {}): Feed {
  let i = 0;
  let held = false;
  let reached!: () => void;
  const f: Feed = {
    pulls: 0,
    cancelled: false,
    reached: new Promise<void>((r) => {
      reached = r;
    }),
    stream: null!,
  };
  f.stream = new ReadableStream<Uint8Array>(
    {
      async pull(c) {
        if (i === o.stopAt && !held) {
          held = true;
          reached();
          o.onStop?.();
          if (o.gate) await o.gate;
          else if (o.then === "error") return c.error(new Error("socket hang up"));
          else return new Promise<void>(() => undefined);
        }
        if (i >= chunks.length) return c.close();
        f.pulls++;
        c.enqueue(chunks[i++]!);
      },
      cancel() {
        f.cancelled = true;
      },
    },
    { highWaterMark: 0 },
  );
  return f;
}

function streamRequest(stream: ReadableStream<Uint8Array>, who: Who, signal?: AbortSignal): Request {
  return new Request("http://localhost:3000/api/manuscripts/x/datasets", {
    method: "POST",
    body: stream,
    duplex: "half",
    signal,
    headers: { "content-type": `multipart/form-data; boundary=${BOUNDARY}`, authorization: `Bearer ${tokens[who]}` },
  } as RequestInit);
}

async function send(req: Request, id = DEMO_MANUSCRIPT_ID) {
  const res = await list.POST(req, { params: Promise.resolve({ id }) });
  const text = await res.text();
  return { status: res.status, json: text ? JSON.parse(text) : null, headers: res.headers };
}

const tmpDir = () => path.join(dir, "uploads", "tmp");
const tmpFiles = () => (fs.existsSync(tmpDir()) ? fs.readdirSync(tmpDir()) : []);

/** Every file under uploads/, relative paths, sorted. */
function walk(root = path.join(dir, "uploads")): string[] {
  if (!fs.existsSync(root)) return [];
  return (fs.readdirSync(root, { recursive: true }) as string[]).filter((p) => fs.statSync(path.join(root, p)).isFile()).sort();
}

async function rowCounts() {
  return { datasets: (await getDb().select().from(datasets)).length, versions: (await getDb().select().from(versions)).length };
}

describe("stream level (readMultipartUpload)", () => {
  it("a body that errors half-way rejects with upload_aborted and removes the part file", async () => {
    vi.spyOn(console, "warn").mockImplementation(() => undefined);
    const f = feed(split(body("half.csv", csv(64 * KiB)), 4 * KiB), { stopAt: 3, then: "error" });
    const err = await readMultipartUpload(streamRequest(f.stream, "author"), 256 * KiB).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(AppError);
    expect(err).toMatchObject({ status: 400, code: "upload_aborted", message: "The upload was aborted by the client after 12288 bytes." });
    expect(f.pulls).toBe(3);
    expect(tmpFiles()).toEqual([]);
  });

  it("a body that stops delivering is aborted after the idle timeout with the stall message", async () => {
    vi.spyOn(console, "warn").mockImplementation(() => undefined);
    const restore = withEnv({ UPLOAD_IDLE_TIMEOUT_MS: "200" });
    try {
      const f = feed(split(body("stall.csv", csv(64 * KiB)), 4 * KiB), { stopAt: 3, then: "stall" });
      const err = await readMultipartUpload(streamRequest(f.stream, "author"), 256 * KiB).catch((e: unknown) => e);
      expect(err).toMatchObject({
        status: 408,
        code: "upload_stalled",
        message: "The upload stalled: no data arrived for 0.2 s after 12288 bytes, so it was stopped. Check the connection and try again.",
      });
      expect(f.cancelled).toBe(true);
      expect(tmpFiles()).toEqual([]);
    } finally {
      restore();
    }
  });

  it("an aborted request signal stops the upload", async () => {
    vi.spyOn(console, "warn").mockImplementation(() => undefined);
    const ac = new AbortController();
    const f = feed(split(body("gone.csv", csv(64 * KiB)), 4 * KiB), { stopAt: 2, then: "stall", onStop: () => ac.abort() });
    const err = await readMultipartUpload(streamRequest(f.stream, "author", ac.signal), 256 * KiB).catch((e: unknown) => e);
    expect(err).toMatchObject({ status: 400, code: "upload_aborted", message: "The upload was aborted by the client after 8192 bytes." });
    expect(f.cancelled).toBe(true);
    expect(tmpFiles()).toEqual([]);
  });

  it("a chunked body over the limit is refused at the limit, not read to the end", async () => {
    const chunk = enc.encode("1,2\n".repeat(16 * KiB));
    const chunks = [enc.encode(fileHead("huge.csv") + "x,y\n"), ...Array.from({ length: 400 }, () => chunk), enc.encode(END)];
    const f = feed(chunks);
    const err = await readMultipartUpload(streamRequest(f.stream, "author"), 256 * KiB).catch((e: unknown) => e);
    expect(err).toMatchObject({ status: 413, code: "too_large", message: "The file is larger than the limit of 0.25 MB." });
    expect(f.pulls).toBeLessThan(20);
    expect(f.cancelled).toBe(true);
    expect(tmpFiles()).toEqual([]);
  });

  it("beforeFile sees the fields sent before the file and can refuse before the file is read", async () => {
    const seen: Array<Record<string, string>> = [];
    const f = feed(split(body("early.csv", csv(240 * KiB), { name: "Early", datasetId: "d-1" }), 2 * KiB));
    const err = await readMultipartUpload(streamRequest(f.stream, "author"), 256 * KiB, {
      beforeFile: async (fields) => {
        seen.push(fields);
        throw new AppError(404, "not_found", "datasetId: no such dataset in this manuscript.");
      },
    }).catch((e: unknown) => e);
    expect(err).toMatchObject({ status: 404, message: "datasetId: no such dataset in this manuscript." });
    expect(seen).toEqual([{ name: "Early", datasetId: "d-1" }]);
    expect(f.pulls).toBeLessThan(40);
    expect(f.cancelled).toBe(true);
    expect(tmpFiles()).toEqual([]);
  });
});

describe("uploads through the route", () => {
  it("a client that goes away mid-upload: 400 upload_aborted, logged once as an abort, nothing kept", async () => {
    const warn = vi.spyOn(console, "warn").mockImplementation(() => undefined);
    const error = vi.spyOn(console, "error");
    const before = walk();
    const counts = await rowCounts();
    const f = feed(split(body("half.csv", csv(64 * KiB), { name: "Half" }), 4 * KiB), { stopAt: 3, then: "error" });
    const r = await send(streamRequest(f.stream, "author"));
    expect(r.status).toBe(400);
    expect(r.json.error).toEqual({ code: "upload_aborted", message: "The upload was aborted by the client after 12288 bytes." });
    expect(warn.mock.calls.filter((c) => String(c[0]).includes("upload"))).toEqual([["[prooflight] upload aborted by the client after 12288 bytes"]]);
    expect(error).not.toHaveBeenCalled();
    expect(walk()).toEqual(before);
    expect(await rowCounts()).toEqual(counts);
  });

  it("a stalled upload is answered 408 after the idle timeout and leaves no part file", async () => {
    vi.spyOn(console, "warn").mockImplementation(() => undefined);
    const restore = withEnv({ UPLOAD_IDLE_TIMEOUT_MS: "200" });
    try {
      const f = feed(split(body("stall.csv", csv(64 * KiB)), 4 * KiB), { stopAt: 3, then: "stall" });
      const r = await send(streamRequest(f.stream, "author"));
      expect(r.status).toBe(408);
      expect(r.json.error.code).toBe("upload_stalled");
      expect(r.json.error.message).toBe(
        "The upload stalled: no data arrived for 0.2 s after 12288 bytes, so it was stopped. Check the connection and try again.",
      );
      expect(f.cancelled).toBe(true);
      expect(tmpFiles()).toEqual([]);
    } finally {
      restore();
    }
  });

  it("a chunked upload over the limit gets 413 without the rest of the body being read", async () => {
    const chunk = enc.encode("1,2\n".repeat(16 * KiB));
    const chunks = [enc.encode(field("name", "Huge") + fileHead("huge.csv") + "x,y\n"), ...Array.from({ length: 400 }, () => chunk), enc.encode(END)];
    const f = feed(chunks);
    const r = await send(streamRequest(f.stream, "author"));
    expect(r.status).toBe(413);
    expect(f.pulls).toBeLessThan(20);
    expect(f.cancelled).toBe(true);
    expect(tmpFiles()).toEqual([]);
  });

  it("a multipart content type without a boundary is a 400, not a 500", async () => {
    const r = await call(list.POST, { method: "POST", token: tokens.author, params, rawBody: "x", headers: { "content-type": "multipart/form-data" } });
    expect(r.status).toBe(400);
    expect(r.json.error.message).toBe("The multipart body is malformed: the content type names no boundary.");
  });

  it("a datasetId of another manuscript is refused before anything is stored, wherever the field comes", async () => {
    const theirs = await call(list.POST, {
      method: "POST",
      token: tokens.outsider,
      params: { id: OTHER_MANUSCRIPT_ID },
      rawBody: uploadForm("theirs.csv", "a,b\n1,2\n"),
    });
    expect(theirs.status).toBe(201);
    const before = walk();
    const counts = await rowCounts();

    // Fields first: the file is not read.
    const f = feed(split(body("mine.csv", csv(240 * KiB), { datasetId: theirs.json.datasetId }), 2 * KiB));
    const early = await send(streamRequest(f.stream, "author"));
    expect(early.status).toBe(404);
    expect(early.json.error.message).toBe("datasetId: no such dataset in this manuscript.");
    expect(f.pulls).toBeLessThan(40);
    expect(f.cancelled).toBe(true);

    // The field after the file: the file is read, but never committed.
    const form = new FormData();
    form.set("file", new Blob(["p,q\n5,6\n7,8\n"]), "late.csv");
    form.set("datasetId", theirs.json.datasetId);
    const late = await upload(form);
    expect(late.status).toBe(404);
    expect(late.json.error.message).toBe("datasetId: no such dataset in this manuscript.");

    // A bad field before the file.
    const bad = await upload(uploadForm("bad.csv", "r,s\n9,10\n", { format: "xlsx" }));
    expect(bad.status).toBe(400);

    expect(walk()).toEqual(before);
    expect(await rowCounts()).toEqual(counts);
  });

  it("at most 2 uploads per user and 3 in total at a time (429 with Retry-After); every slot comes back", async () => {
    const { uploadSlotUsage } = await import("@/lib/server/storage/upload-slots");
    const restore = withEnv({ UPLOADS_PER_USER: "2", UPLOADS_IN_TOTAL: "3" });
    try {
      // Failed uploads give their slot back: three in a row with room for two.
      for (let i = 0; i < 3; i++) expect((await upload(uploadForm("ragged.csv", "a,b\n1,2\n3,4,5\n"))).status).toBe(422);
      expect(uploadSlotUsage()).toEqual({ total: 0, byUser: {} });

      const held = (who: Who, n: number) => {
        let open!: () => void;
        const gate = new Promise<void>((r) => {
          open = r;
        });
        const f = feed(split(body(`held-${who}-${n}.csv`, `k,v\n${n},${n}\n`), 64), { stopAt: 1, gate });
        return { f, open, res: send(streamRequest(f.stream, who)) };
      };
      const a1 = held("author", 1);
      const a2 = held("author", 2);
      await Promise.all([a1.f.reached, a2.f.reached]);
      const a3 = await upload(uploadForm("a3.csv", "k,v\n3,3\n"));
      expect(a3.status).toBe(429);
      expect(a3.headers.get("retry-after")).toBe("30");
      expect(a3.json.error.message).toBe("You already have 2 uploads in progress. Wait for one to finish, then try again.");

      const p1 = held("pi", 1);
      await p1.f.reached;
      expect(uploadSlotUsage()).toEqual({ total: 3, byUser: { "demo-author": 2, "demo-pi": 1 } });
      const p2 = await upload(uploadForm("p2.csv", "k,v\n4,4\n"), "pi");
      expect(p2.status).toBe(429);
      expect(p2.headers.get("retry-after")).toBe("30");
      expect(p2.json.error.message).toBe("The server is handling 3 uploads already. Try again in a moment.");

      for (const h of [a1, a2, p1]) h.open();
      expect((await Promise.all([a1.res, a2.res, p1.res])).map((r) => r.status)).toEqual([201, 201, 201]);
      expect(uploadSlotUsage()).toEqual({ total: 0, byUser: {} });
      expect((await upload(uploadForm("after.csv", "k,v\n5,5\n"))).status).toBe(201);
    } finally {
      restore();
    }
  });

  it("more than 120 uploads an hour by one user: 429 with Retry-After, and no slot is held", async () => {
    const { uploadSlotUsage } = await import("@/lib/server/storage/upload-slots");
    const at = new Date(Date.now() - 60_000);
    await getDb()
      .insert(rateEvents)
      .values(Array.from({ length: 120 }, () => ({ bucket: "upload:user:demo-pi", at })));
    try {
      const r = await upload(uploadForm("r.csv", "m,n\n1,2\n"), "pi");
      expect(r.status).toBe(429);
      expect(r.json.error.message).toBe("You have started 120 uploads in the last hour. Try again in 59 min.");
      const wait = Number(r.headers.get("retry-after"));
      expect(wait).toBeGreaterThan(3000);
      expect(wait).toBeLessThanOrEqual(3540);
      expect(uploadSlotUsage()).toEqual({ total: 0, byUser: {} });
      expect((await upload(uploadForm("r.csv", "m,n\n1,2\n"), "author")).status).toBe(201);
    } finally {
      await getDb().delete(rateEvents).where(eq(rateEvents.bucket, "upload:user:demo-pi"));
    }
    expect((await upload(uploadForm("r2.csv", "m,n\n3,4\n"), "pi")).status).toBe(201);
  });

  it("bidi and other control characters are taken out of file and dataset names and downloads", async () => {
    const r = await upload(uploadForm("invoice\u202Egnp.exe", "a\n1\n"));
    expect(r.status).toBe(201);
    expect(r.json.fileName).toBe("invoicegnp.exe");
    const ds = await call(dataset.GET, { token: tokens.viewer, params: { id: r.json.datasetId } });
    expect(ds.json.name).toBe("invoicegnp.exe");

    const named = await upload(uploadForm("n.csv", "a\n2\n", { name: "Echo\u2067 NV03\u2069\u200B" }));
    expect(named.status).toBe(201);
    const nds = await call(dataset.GET, { token: tokens.viewer, params: { id: named.json.datasetId } });
    expect(nds.json.name).toBe("Echo NV03");

    const download = async (id: string) => {
      const res = await raw.GET(new Request("http://localhost/x", { headers: { authorization: `Bearer ${tokens.pi}` } }), { params: Promise.resolve({ id }) });
      expect(res.status).toBe(200);
      await res.arrayBuffer();
      return res.headers.get("content-disposition");
    };
    expect(await download(r.json.id)).toBe(`attachment; filename="invoicegnp.exe"; filename*=UTF-8''invoicegnp.exe`);

    // A name stored before names were cleaned is cleaned on the way out.
    await getDb().update(versions).set({ fileName: "report\u2067\u202Eslx.exe\u2069 (final).csv" }).where(eq(versions.id, r.json.id));
    expect(await download(r.json.id)).toBe(`attachment; filename="reportslx.exe (final).csv"; filename*=UTF-8''reportslx.exe%20%28final%29.csv`);
  });
});
