import "server-only";
import fs from "node:fs";
import path from "node:path";
import { decodeColumnar } from "@/lib/data/columnar";
import type { ParsedTable } from "@/lib/data/parse";
import { ingestInChild, type IngestedTable, type IngestJob } from "../datasets/ingest-in-child";

let nextFile = 0;

/**
 * Parses a file's bytes again as an upload is parsed: in the ingest child, under its memory and time
 * budget, so the server never holds the parse of a large file. Returns what the child reports of the
 * table (as recorded at upload) and its parsed columns. `dir` is a private folder for the two
 * temporary files, removed here either way.
 */
export async function reparseInChild(
  bytes: Uint8Array,
  fileName: string,
  options: IngestJob["options"],
  dir: string,
): Promise<{ described: IngestedTable; table: ParsedTable }> {
  const n = nextFile++;
  const input = path.join(dir, `${n}.in`);
  const output = path.join(dir, `${n}.columns`);
  try {
    await fs.promises.writeFile(input, bytes, { flag: "wx" });
    const described = await ingestInChild({ input, output, fileName, options });
    return { described, table: decodeColumnar(new Uint8Array(await fs.promises.readFile(output))) };
  } finally {
    await fs.promises.rm(input, { force: true });
    await fs.promises.rm(output, { force: true });
  }
}
