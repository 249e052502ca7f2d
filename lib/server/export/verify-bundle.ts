import "server-only";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { ParsedTable } from "@/lib/data/parse";
import type { RowTable } from "@/lib/data/table-rows";
import { authorize, type SessionUser } from "@/lib/authz";
import { env } from "@/lib/env";
import { badRequest } from "@/lib/errors";
import { sha256Hex } from "../crypto";
import { consumeRate } from "../limits/rate-limit";
import { readFileBytes, removeTemp } from "../storage/blob-store";
import { readMultipartUpload } from "../storage/multipart";
import { acquireUploadSlot } from "../storage/upload-slots";
import { BUNDLE_PATHS, type BundleParseRecord, type BundlePanelData, type BundleRender } from "./bundle-layout";
import { unpackArchive } from "./safe-unzip";
import { VERIFY_TOLERANCES, type VerifyRow, type Entity, readJson, short, type VerifyReport } from "./verify/common";
import { parseRow } from "./verify/parse";
import { boundRows } from "./verify/rows";
import { fitRow } from "./verify/fit";
import { renderRows } from "./verify/render";

/**
 * Checks a reproducibility bundle from its own contents: re-hashes every file against
 * ro-crate-metadata.json, re-parses every raw and derived file and compares it with what the
 * application recorded and with the rows each panel was drawn from, re-runs every fit from its
 * recorded model and options, and draws the figure again from the specs and rows to compare with
 * figure.svg. Reads no database: the answer depends on the zip alone.
 */
export async function verifyBundle(zipBytes: Uint8Array): Promise<VerifyReport> {
  const files = unpackArchive(zipBytes);
  const rows: VerifyRow[] = [];
  const report = () => ({ ok: rows.length > 0 && rows.every((r) => r.match), bundleSha256: sha256Hex(zipBytes), tolerances: VERIFY_TOLERANCES, rows });

  const metadata = readJson(files, BUNDLE_PATHS.metadata);
  const graph = metadata.ok && Array.isArray(metadata.value["@graph"]) ? (metadata.value["@graph"] as Entity[]) : null;
  if (!graph) {
    rows.push({ item: BUNDLE_PATHS.metadata, check: "bundle", match: false, detail: metadata.ok ? "has no @graph" : metadata.error });
    return report();
  }
  const entities = new Map(graph.filter((e) => e && typeof e["@id"] === "string").map((e) => [e["@id"], e]));

  // 1. Every file against its recorded SHA-256 and size; every file in the zip listed.
  const listed = graph.filter((e) => e["@type"] === "File" || (Array.isArray(e["@type"]) && e["@type"].includes("File")));
  const listedIds = new Set(listed.map((e) => e["@id"]));
  for (const e of listed) rows.push(hashRow(e, files[e["@id"]]));
  for (const path of Object.keys(files).sort())
    if (path !== BUNDLE_PATHS.metadata && !listedIds.has(path))
      rows.push({ item: path, check: "sha256", match: false, detail: "in the zip but not listed in ro-crate-metadata.json" });

  // 2. Every raw and derived file parsed again and compared with the record of its parse at upload.
  const parsedRecord = readJson(files, BUNDLE_PATHS.parsed);
  const tables = new Map<string, ParsedTable>();
  if (!parsedRecord.ok) rows.push({ item: BUNDLE_PATHS.parsed, check: "bundle", match: false, detail: parsedRecord.error });
  else {
    const dir = await fs.promises.mkdtemp(path.join(os.tmpdir(), "prooflight-verify-"));
    try {
      for (const [file, rec] of Object.entries(parsedRecord.value as Record<string, BundleParseRecord>)) {
        const { row, table } = await parseRow(file, rec, files[file], dir);
        rows.push(row);
        if (table) tables.set(file, table);
      }
    } finally {
      await fs.promises.rm(dir, { recursive: true, force: true });
    }
  }

  // 3. The rows each panel was drawn from, read again from those files (or the fit report).
  const render = readJson(files, BUNDLE_PATHS.render);
  const renderRecord = render.ok ? (render.value as unknown as BundleRender) : null;
  if (!renderRecord) rows.push({ item: BUNDLE_PATHS.render, check: "bundle", match: false, detail: render.ok ? "" : render.error });
  // One panel's recorded rows are held at a time; what is drawn again keeps the columns read again.
  const panelTables = new Map<string, Record<string, RowTable>>();
  for (const panel of renderRecord?.panels ?? []) {
    const data = readJson(files, panel.data);
    if (!data.ok) {
      rows.push({ item: `panel ${panel.letter}`, check: "rows", match: false, detail: data.error });
      continue;
    }
    const bound: Record<string, RowTable> = {};
    for (const [name, b] of Object.entries((data.value as unknown as BundlePanelData).data ?? {})) {
      const checked = boundRows(`panel ${panel.letter} · ${name}`, b, tables, files);
      rows.push(checked.row);
      bound[name] = checked.table;
    }
    panelTables.set(panel.letter, bound);
  }

  // 4. Every fit run again from its recorded model and options on the raw file it read.
  for (const fit of graph.filter((e) => e["@type"] === "CreateAction" && e["@id"].startsWith("#fit-"))) rows.push(fitRow(fit, entities, files, tables));

  // 5. The figure drawn again from the specs and rows, compared with figure.svg panel by panel.
  if (renderRecord) rows.push(...(await renderRows(renderRecord, panelTables, files)));

  return report();
}

/** Bundles a person may check per hour: each one re-runs every fit and draws the figure again. */
const VERIFIES_PER_HOUR = 60;

/**
 * POST /api/bundles/verify: the zip as the multipart `file` part (up to UPLOAD_MAX_BYTES), checked from its
 * own contents. Nothing is stored: the upload's temporary file is removed whatever the outcome.
 */
export async function verifyUploadedBundle(user: SessionUser, req: Request): Promise<VerifyReport> {
  await authorize(user, "bundle.verify");
  const release = acquireUploadSlot(user.id);
  try {
    await consumeRate([
      {
        bucket: `bundle-verify:user:${user.id}`,
        max: VERIFIES_PER_HOUR,
        windowMs: 3600_000,
        message: `You have checked ${VERIFIES_PER_HOUR} bundles in the last hour.`,
      },
    ]);
    const { file } = await readMultipartUpload(req, env().uploadMaxBytes);
    if (!file) throw badRequest("file: the multipart body has no `file` part (the bundle's .zip).");
    try {
      return await verifyBundle(await readFileBytes(file.tmp));
    } finally {
      await removeTemp(file.tmp);
    }
  } finally {
    release();
  }
}

function hashRow(e: Entity, bytes: Uint8Array | undefined): VerifyRow {
  const item = e["@id"];
  if (!bytes) return { item, check: "sha256", match: false, detail: "listed in ro-crate-metadata.json but missing from the zip" };
  const actual = sha256Hex(bytes);
  const recorded = typeof e.sha256 === "string" ? e.sha256 : "(none)";
  const size = String(bytes.byteLength);
  if (actual !== recorded) return { item, check: "sha256", match: false, detail: `recorded ${short(recorded)}…, file ${short(actual)}… (${size} bytes)` };
  if (e.contentSize !== size) return { item, check: "sha256", match: false, detail: `recorded size ${String(e.contentSize)} bytes, file ${size} bytes` };
  return { item, check: "sha256", match: true, detail: `${short(actual)}…, ${size} bytes` };
}

/** The report as a plain-text table: item, check, match or mismatch, and the detail; the tolerances first. */
export function formatVerifyReport(report: VerifyReport): string {
  const head = ["Item", "Check", "Result", "Detail"];
  const body = report.rows.map((r) => [r.item, r.check, r.match ? "match" : "MISMATCH", r.detail]);
  const widths = [0, 1, 2].map((i) => Math.max(head[i].length, ...body.map((r) => r[i].length)));
  const line = (cells: string[]) =>
    cells
      .map((c, i) => (i < 3 ? c.padEnd(widths[i]) : c))
      .join("  ")
      .trimEnd();
  const failed = report.rows.filter((r) => !r.match);
  return [
    `Bundle sha256 ${report.bundleSha256}`,
    "Tolerances:",
    ...Object.entries(report.tolerances).map(([k, v]) => `  ${k}: ${v}`),
    "",
    line(head),
    line(widths.map((w) => "-".repeat(w)).concat("------")),
    ...body.map(line),
    "",
    report.ok
      ? `All ${report.rows.length} checks match.`
      : `${failed.length} of ${report.rows.length} checks do not match: ${[...new Set(failed.map((r) => r.item))].join(", ")}.`,
  ].join("\n");
}
