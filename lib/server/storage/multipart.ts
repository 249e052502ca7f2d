import Busboy from "busboy";
import { Readable } from "node:stream";
import { badRequest, tooLarge, unsupported } from "../errors";
import { TooLargeError, removeTemp, writeStreamToTemp } from "./blob-store";

export interface UploadedFile { tmp: string; sha256: string; byteSize: number; fileName: string }
export interface MultipartUpload { fields: Record<string, string>; file: UploadedFile | null }

const MB = 1024 * 1024;

/**
 * Streams a multipart body: the file part goes straight to a temporary file (hashed on the way),
 * the size limit is enforced while streaming, and the client's file name is kept only as a label.
 */
export async function readMultipartUpload(req: Request, maxBytes: number): Promise<MultipartUpload> {
  const type = req.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("multipart/form-data")) throw unsupported("Send the upload as multipart/form-data with a `file` part.");
  const declared = Number(req.headers.get("content-length") ?? "0");
  if (declared > maxBytes + MB) throw tooLarge(`The upload is ${(declared / MB).toFixed(1)} MB; the limit is ${(maxBytes / MB).toFixed(0)} MB.`);
  if (!req.body) throw badRequest("The request has no body.");

  const fields: Record<string, string> = {};
  let pending: Promise<UploadedFile> | null = null;
  const bb = Busboy({ headers: { "content-type": type }, defParamCharset: "utf8", limits: { files: 1, fields: 20, fieldSize: 1 * MB, fileSize: maxBytes + 1 } });
  const done = new Promise<void>((resolve, reject) => {
    bb.on("field", (name, value) => { fields[name] = value; });
    bb.on("file", (name, stream, info) => {
      if (name !== "file") { stream.resume(); return; }
      const fileName = sanitiseFileName(info.filename);
      pending = writeStreamToTemp(stream as AsyncIterable<Uint8Array>, maxBytes).then((r) => ({ ...r, fileName }));
      pending.catch(() => stream.resume());
    });
    bb.on("error", reject);
    bb.on("close", resolve);
  });
  Readable.fromWeb(req.body as import("node:stream/web").ReadableStream).pipe(bb);
  try {
    await done;
    const file = pending ? await pending : null;
    return { fields, file };
  } catch (err) {
    if (pending) await (pending as Promise<UploadedFile>).then((f) => removeTemp(f.tmp), () => undefined);
    if (err instanceof TooLargeError) throw tooLarge(`The file is larger than the limit of ${(err.limit / MB).toFixed(0)} MB.`);
    if (err instanceof Error && /Unexpected end of form|Malformed/i.test(err.message)) throw badRequest(`The multipart body is malformed: ${err.message}.`);
    throw err;
  }
}

/** A label for display and Content-Disposition only; never used as a path. */
export function sanitiseFileName(name: string | undefined): string {
  const base = (name ?? "").split(/[\\/]/).pop() ?? "";
  // eslint-disable-next-line no-control-regex -- control characters are exactly what must go
  const clean = base.replace(/[\u0000-\u001f\u007f]/g, "").trim().slice(0, 200);
  return clean || "upload";
}
