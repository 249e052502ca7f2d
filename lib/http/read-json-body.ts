/**
 * Request bodies read with a cap: chunk by chunk, counting bytes, and refused with 413 the moment
 * the cap is passed (the rest is never read). JSON bodies are then decoded as strict UTF-8, parsed
 * (a 400 names line and column) and walked without recursion: nesting deeper than
 * MAX_JSON_DEPTH and `__proto__` keys are refused with 400 naming the path.
 */
import { env } from "@/lib/env";
import { findJsonSyntaxError, lineColumnAt } from "@/lib/data/parse/json-syntax";
import { badRequest, tooLarge, unsupported } from "@/lib/errors";

/** Objects and arrays inside one another; the body itself is level 1. */
const MAX_JSON_DEPTH = 64;
/** Routes that carry a Vega-Lite spec (panel revisions) may send more. */
export const SPEC_BODY_MAX_BYTES = 2 * 1024 * 1024;

/** `1 MB (1,048,576 bytes)`, `64 kB (65,536 bytes)`: binary units, with the exact count. */
export function describeLimit(bytes: number): string {
  const exact = `${bytes.toLocaleString("en-US")} bytes`;
  if (bytes >= 1024 * 1024 && bytes % (1024 * 1024) === 0) return `${bytes / (1024 * 1024)} MB (${exact})`;
  if (bytes >= 1024 && bytes % 1024 === 0) return `${bytes / 1024} kB (${exact})`;
  return exact;
}

const overLimit = (maxBytes: number) => tooLarge(`The request body is larger than the limit of ${describeLimit(maxBytes)}.`);

/**
 * The body's bytes, at most `maxBytes` of them. A Content-Length over the cap is refused before
 * anything is read; otherwise the stream is counted as it arrives and cancelled once past the cap.
 */
export async function readBodyBytes(req: Request, maxBytes: number): Promise<Uint8Array> {
  const declared = req.headers.get("content-length");
  if (declared !== null && /^\d+$/.test(declared.trim()) && Number(declared.trim()) > maxBytes) {
    await req.body?.cancel().catch(() => undefined);
    throw overLimit(maxBytes);
  }
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      total += value.byteLength;
      if (total > maxBytes) {
        await reader.cancel().catch(() => undefined);
        throw overLimit(maxBytes);
      }
      chunks.push(value);
    }
  } finally {
    reader.releaseLock();
  }
  if (chunks.length === 1) return chunks[0];
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** A copy of `req` whose body has been read (and capped) already, for code that reads the body itself. */
export async function withBufferedBody(req: Request, maxBytes: number): Promise<Request> {
  if (!req.body) return req;
  const bytes = await readBodyBytes(req, maxBytes);
  const headers = new Headers(req.headers);
  headers.delete("transfer-encoding");
  headers.set("content-length", String(bytes.byteLength));
  return new Request(req.url, { method: req.method, headers, body: bytes.byteLength ? (bytes as BodyInit) : null, signal: req.signal });
}

const IDENTIFIER = /^[A-Za-z_$][\w$]*$/;

interface Frame {
  value: object;
  depth: number;
  parent: Frame | null;
  key: string | number | null;
}

function pathOf(frame: Frame | null, last?: string): string {
  const steps: Array<string | number> = last === undefined ? [] : [last];
  for (let f = frame; f && f.key !== null; f = f.parent) steps.push(f.key);
  let out = "";
  for (const step of steps.reverse()) {
    if (typeof step === "number") out += `[${step}]`;
    else if (IDENTIFIER.test(step)) out += out ? `.${step}` : step;
    else out += `[${JSON.stringify(step)}]`;
  }
  return out || "(body)";
}

/**
 * Walks a parsed JSON value with an explicit stack: refuses nesting deeper than `maxDepth` and
 * any `__proto__` key (JSON.parse makes it an own property; spreading or merging it later would
 * not be harmless), each with a 400 naming the path such as `doc.content[0].__proto__`.
 */
export function checkJsonShape(value: unknown, maxDepth = MAX_JSON_DEPTH): void {
  if (value === null || typeof value !== "object") return;
  const stack: Frame[] = [{ value, depth: 1, parent: null, key: null }];
  while (stack.length) {
    const frame = stack.pop()!;
    if (frame.depth > maxDepth) {
      throw badRequest(`The request body nests objects and arrays more than ${maxDepth} levels deep (at ${pathOf(frame)}).`);
    }
    const v = frame.value;
    if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) {
        const child: unknown = v[i];
        if (child !== null && typeof child === "object") stack.push({ value: child, depth: frame.depth + 1, parent: frame, key: i });
      }
      continue;
    }
    const keys = Object.keys(v);
    for (const key of keys) {
      if (key === "__proto__") throw badRequest(`${pathOf(frame, key)}: "__proto__" is not allowed as a key in the request body.`);
    }
    for (let i = keys.length - 1; i >= 0; i--) {
      const child: unknown = (v as Record<string, unknown>)[keys[i]];
      if (child !== null && typeof child === "object") stack.push({ value: child, depth: frame.depth + 1, parent: frame, key: keys[i] });
    }
  }
}

/** JSON text → value, with a 400 naming line and column when it is malformed. */
function parseJsonText(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch (e) {
    const found = findJsonSyntaxError(text);
    if (!found) throw badRequest(`The request body is not valid JSON: ${(e as Error).message}.`);
    const { line, column } = lineColumnAt(text, found.offset);
    throw badRequest(`The request body is not valid JSON: line ${line}, column ${column}: ${found.problem}.`);
  }
}

export interface ReadJsonOptions {
  /** Defaults to JSON_BODY_MAX_BYTES (1 MB). */
  maxBytes?: number;
  maxDepth?: number;
}

/** `application/json`, `application/<x>+json` or no type at all (a bare script); anything else says it is not JSON. */
function checkJsonContentType(req: Request): void {
  const type = req.headers.get("content-type");
  if (type === null || !type.trim()) return;
  const essence = type.split(";")[0].trim().toLowerCase();
  if (essence === "application/json" || /^application\/[\w.+-]+\+json$/.test(essence)) return;
  throw unsupported(`This route takes JSON: send Content-Type: application/json (the request said ${JSON.stringify(essence.slice(0, 80))}).`);
}

/** The one reader of JSON request bodies. An empty body reads as `{}`. */
export async function readJsonBody(req: Request, options: ReadJsonOptions = {}): Promise<unknown> {
  checkJsonContentType(req);
  const bytes = await readBodyBytes(req, options.maxBytes ?? env().jsonBodyMaxBytes);
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw badRequest("The request body is not valid UTF-8 text.");
  }
  if (!text.trim()) return {};
  const value = parseJsonText(text);
  checkJsonShape(value, options.maxDepth ?? MAX_JSON_DEPTH);
  return value;
}
