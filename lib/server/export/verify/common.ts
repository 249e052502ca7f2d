/** What every check of a bundle shares: the tolerances, a row of the report, reading a JSON file of the zip. */
import "server-only";
import { strFromU8 } from "fflate";
import type { FitOptions } from "../../analyses/schemas";

/** Fitted parameters and their standard errors must agree to this relative difference. */
export const FIT_RELATIVE_TOLERANCE = 1e-6;
export const TOL = FIT_RELATIVE_TOLERANCE.toExponential(); // "1e-6"

export const VERIFY_TOLERANCES = {
  sha256: "exact: every file's SHA-256 and size as ro-crate-metadata.json lists them",
  parse: "exact: format, encoding, delimiter, decimal mark, columns, row count and column statistics as recorded at upload",
  rows: "exact: every row each panel was drawn from, re-read from the raw or derived file (or the fit report)",
  fit: `${TOL} relative: each fitted parameter and standard error, re-fitted from the recorded model and options; the fitted curve to ${TOL} of its largest |y|; the fitted points exact`,
  render: "identical SVG after canonicalisation (line endings, whitespace between tags, element ids numbered in order of appearance)",
} as const;

type VerifyCheck = keyof typeof VERIFY_TOLERANCES | "bundle";

export interface VerifyRow {
  /** The file, fit or panel checked. */
  item: string;
  check: VerifyCheck;
  match: boolean;
  /** What was compared; the numbers when they differ. */
  detail: string;
}

export interface VerifyReport {
  ok: boolean;
  /** SHA-256 of the zip as received. */
  bundleSha256: string;
  tolerances: typeof VERIFY_TOLERANCES;
  rows: VerifyRow[];
}

export type Json = Record<string, unknown>;
export type Entity = Json & { "@id": string; "@type": string | string[] };

export function readJson(files: Record<string, Uint8Array>, path: string): { ok: true; value: Json } | { ok: false; error: string } {
  const bytes = files[path];
  if (!bytes) return { ok: false, error: `${path} is missing from the bundle` };
  try {
    const value = JSON.parse(strFromU8(bytes)) as unknown;
    if (!value || typeof value !== "object") return { ok: false, error: `${path} is not a JSON object` };
    return { ok: true, value: value as Json };
  } catch (err) {
    return { ok: false, error: `${path} is not valid JSON (${(err as Error).message})` };
  }
}

export function fitReport(
  files: Record<string, Uint8Array>,
  path: string,
): { model: string; modelVersion: string; options: FitOptions; result: Json; inputSha256: string } | string {
  const r = readJson(files, path);
  if (!r.ok) return r.error;
  const v = r.value;
  if (typeof v.model !== "string" || !v.options || typeof v.options !== "object" || !v.result || typeof v.result !== "object")
    return `${path} does not name a model, options and result`;
  return v as never;
}

export const short = (sha: string) => sha.slice(0, 16);
