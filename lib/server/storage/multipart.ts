import "server-only";
import Busboy from "busboy";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import type { ReadableStream as NodeReadableStream } from "node:stream/web";
import { env } from "@/lib/env";
import { AppError, badRequest, tooLarge, unsupported } from "@/lib/errors";
import { TooLargeError, removeTemp, writeStreamToTemp } from "./blob-store";
import { sanitiseFileName } from "./file-name";

export interface UploadedFile {
  tmp: string;
  sha256: string;
  byteSize: number;
  fileName: string;
}
export interface MultipartUpload {
  fields: Record<string, string>;
  file: UploadedFile | null;
}

export interface ReadUploadOptions {
  /**
   * Called with the fields sent before the file part, before any of the file is written. Throw to
   * refuse the upload: nothing more is read, nothing is kept, and the error is what the caller gets.
   * Fields sent after the file are not seen here; validate them again once the upload is read.
   */
  beforeFile?: (fields: Record<string, string>) => Promise<void> | void;
  /** Stop when the client sends nothing for this long while we wait for data; defaults to `env().uploadIdleTimeoutMs`. */
  idleTimeoutMs?: number;
}

const MB = 1024 * 1024;
const MAX_FIELDS = 20;
/** 200 → "200", 0.25 → "0.25". */
const mb = (bytes: number) => String(Number((bytes / MB).toFixed(2)));

/** The client went away (connection reset, request aborted). Logged as a warning, never as an unexpected error. */
const uploadAborted = (bytes: number) => new AppError(400, "upload_aborted", `The upload was aborted by the client after ${bytes} bytes.`);
const uploadStalled = (idleMs: number, bytes: number) =>
  new AppError(
    408,
    "upload_stalled",
    `The upload stalled: no data arrived for ${idleMs / 1000} s after ${bytes} bytes, so it was stopped. Check the connection and try again.`,
  );

/**
 * Streams a multipart body: the file part goes straight to a temporary file (hashed on the way),
 * the size limit is enforced while streaming, and the client's file name is kept only as a label
 * (see `sanitiseFileName`).
 *
 * The promise always settles, and on failure no part file is left behind: the first error (file over
 * the limit, `beforeFile` refusing, a malformed body, the client aborting or `req.signal` firing, or
 * no byte for `idleTimeoutMs`) stops reading, cancels the request body, tears busboy down and removes
 * the part file before the error is thrown.
 */
export async function readMultipartUpload(req: Request, maxBytes: number, options: ReadUploadOptions = {}): Promise<MultipartUpload> {
  const type = req.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("multipart/form-data")) throw unsupported("Send the upload as multipart/form-data with a `file` part.");
  const declared = Number(req.headers.get("content-length") ?? "0");
  if (declared > maxBytes + MB) throw tooLarge(`The upload is ${(declared / MB).toFixed(1)} MB; the limit is ${mb(maxBytes)} MB.`);
  if (!req.body) throw badRequest("The request has no body.");

  let bb: ReturnType<typeof Busboy>;
  try {
    bb = Busboy({
      headers: { "content-type": type },
      defParamCharset: "utf8",
      limits: { files: 1, fields: MAX_FIELDS, fieldSize: 1 * MB, fileSize: maxBytes + 1 },
    });
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    throw badRequest(`The multipart body is malformed: ${/boundary/i.test(message) ? "the content type names no boundary" : message}.`);
  }

  const idleMs = options.idleTimeoutMs ?? env().uploadIdleTimeoutMs;
  // Fields and part headers on top of the file: the same allowance as the Content-Length check above.
  const bodyLimit = maxBytes + MB;
  const fields: Record<string, string> = {};
  const file: { stream?: Readable; pending?: Promise<UploadedFile> } = {};
  const reader = req.body.getReader();
  const stop = new AbortController();
  const signal = req.signal;
  let received = 0;
  let failed = false;
  let failure: unknown;
  let timer: ReturnType<typeof setTimeout> | undefined;

  /** The first error wins: stop reading, release the body, end the file part (its writer removes the part file). */
  const fail = (err: unknown) => {
    if (failed) return;
    failed = true;
    failure = err;
    clearTimeout(timer);
    stop.abort(err);
    reader.cancel(err).catch(() => undefined);
    file.stream?.destroy(err instanceof Error ? err : new Error(String(err)));
  };
  const onAbort = () => fail(uploadAborted(received));

  // Pulls from the client only when busboy wants more, so the idle clock runs only while we wait on the client.
  const metered = new ReadableStream<Uint8Array>(
    {
      pull: async (c) => {
        timer = setTimeout(() => fail(uploadStalled(idleMs, received)), idleMs);
        let r: ReadableStreamReadResult<Uint8Array>;
        try {
          r = await reader.read();
        } catch {
          // The request body itself failed: the connection was reset or the request aborted.
          fail(uploadAborted(received));
          return c.error(failure);
        } finally {
          clearTimeout(timer);
        }
        if (failed) return c.error(failure);
        if (r.done) return c.close();
        received += r.value.byteLength;
        if (received > bodyLimit) {
          fail(tooLarge(`The upload is larger than the limit of ${mb(maxBytes)} MB.`));
          return c.error(failure);
        }
        c.enqueue(r.value);
      },
      cancel: (reason) => reader.cancel(reason).catch(() => undefined),
    },
    { highWaterMark: 0 },
  );

  bb.on("field", (name, value) => {
    fields[name] = value;
  });
  // Busboy drops what is past its limits without a word; a dropped field or file must not pass unseen.
  bb.on("fieldsLimit", () =>
    fail(badRequest(`The upload has more than ${MAX_FIELDS} form fields; send file, name, metadata, datasetId, delimiter, decimal and format only.`)),
  );
  bb.on("filesLimit", () => fail(badRequest("file: the upload has more than one file part; send one file per upload.")));
  bb.on("file", (name, stream, info) => {
    // Destroyed streams emit "error"; unheard, that would crash the process.
    stream.on("error", () => undefined);
    if (name !== "file") {
      stream.resume();
      fail(badRequest(`file: the upload's file part is named "${name.slice(0, 40)}"; name it "file".`));
      return;
    }
    if (file.pending) {
      stream.resume();
      fail(badRequest("file: the upload has more than one file part; send one file per upload."));
      return;
    }
    file.stream = stream;
    // Busboy cuts the file at maxBytes + 1 and would then race through the rest of the body discarding it.
    // Deferred: busboy still touches the file stream right after emitting "limit".
    stream.on("limit", () => queueMicrotask(() => fail(new TooLargeError(maxBytes))));
    const fileName = sanitiseFileName(info.filename);
    file.pending = (async () => {
      if (options.beforeFile) await options.beforeFile({ ...fields });
      if (failed) throw failure;
      const stored = await writeStreamToTemp(stream as AsyncIterable<Uint8Array>, maxBytes);
      return { ...stored, fileName };
    })();
    file.pending.catch(fail);
  });

  if (signal?.aborted) onAbort();
  else signal?.addEventListener("abort", onAbort, { once: true });
  const stopped = new Promise<void>((resolve) => stop.signal.addEventListener("abort", () => resolve(), { once: true }));
  const parsed = pipeline(Readable.fromWeb(metered as unknown as NodeReadableStream<Uint8Array>), bb, { signal: stop.signal }).catch((err: unknown) =>
    fail(signal?.aborted ? uploadAborted(received) : describeParseError(err)),
  );

  try {
    await Promise.race([parsed, stopped]);
    const stored =
      !failed && file.pending
        ? await file.pending.catch((err: unknown) => {
            fail(err);
            return null;
          })
        : null;
    if (!failed) return { fields, file: stored };
    // A file stored completely before a later failure (e.g. a malformed tail) is removed here; otherwise its writer already did.
    if (file.pending)
      await file.pending.then(
        (f) => removeTemp(f.tmp),
        () => undefined,
      );
    // Nothing reads past a failure, so `received` is the count at the moment it happened.
    if (failure instanceof AppError && failure.code === "upload_aborted") console.warn(`[prooflight] upload aborted by the client after ${received} bytes`);
    if (failure instanceof AppError && failure.code === "upload_stalled")
      console.warn(`[prooflight] upload stalled: no data for ${idleMs} ms after ${received} bytes; stopped`);
    throw failure instanceof TooLargeError ? tooLarge(`The file is larger than the limit of ${mb(failure.limit)} MB.`) : failure;
  } finally {
    clearTimeout(timer);
    signal?.removeEventListener("abort", onAbort);
  }
}

function describeParseError(err: unknown): unknown {
  if (err instanceof Error && /Unexpected end of (form|file)|Malformed/i.test(err.message))
    return badRequest(`The multipart body is malformed: ${err.message}.`);
  return err;
}
