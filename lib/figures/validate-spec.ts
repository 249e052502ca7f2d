/**
 * Validation of a panel spec before it is stored (DESIGN.md §5, issue 5 §7): plain JSON under a
 * size cap, the security rules of ./spec-security, then the Vega-Lite JSON schema (checked by
 * the interpreter in ./json-schema-check; see there for why not ajv). Never throws.
 */
import type { TopLevelSpec } from "vega-lite";
import vegaLiteSchema from "vega-lite/vega-lite-schema.json";
import { createSchemaChecker, type SchemaChecker } from "./json-schema-check";
import { checkSpecSecurity } from "./spec-security";
import { formatPath, toPointer, type SpecPath } from "./spec-path";

export const MAX_SPEC_BYTES = 256 * 1024;
const MAX_SPEC_DEPTH = 64;
/** At most this many errors are reported. */
const MAX_REPORTED_ERRORS = 10;

export interface SpecError {
  /** Readable path, e.g. "layer[1].encoding.href"; "(root)" for the spec itself. */
  path: string;
  /** The same place as an RFC 6901 JSON Pointer, e.g. "/layer/1/encoding/href". */
  pointer: string;
  message: string;
}

export type ValidateSpecResult = { ok: true; spec: TopLevelSpec; dataNames: string[] } | { ok: false; errors: SpecError[] };

let checker: SchemaChecker | null = null;
function schemaChecker(): SchemaChecker {
  checker ??= createSchemaChecker(vegaLiteSchema);
  return checker;
}

const error = (path: SpecPath, message: string): SpecError => ({ path: formatPath(path), pointer: toPointer(path), message });

function depthOf(value: unknown, limit: number): number {
  let max = 0;
  const stack: Array<[unknown, number]> = [[value, 0]];
  while (stack.length) {
    const [v, d] = stack.pop()!;
    if (d > max) max = d;
    if (max > limit) return max;
    if (v && typeof v === "object") for (const child of Object.values(v)) stack.push([child, d + 1]);
  }
  return max;
}

/** Non-finite numbers would silently become null in JSON; report where they are instead. */
function findNonFinite(value: unknown, path: Array<string | number> = []): SpecPath | null {
  if (typeof value === "number") return Number.isFinite(value) ? null : path;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const p = findNonFinite(value[i], [...path, i]);
      if (p) return p;
    }
  } else if (value && typeof value === "object") {
    for (const [k, v] of Object.entries(value)) {
      const p = findNonFinite(v, [...path, k]);
      if (p) return p;
    }
  }
  return null;
}

/** Validates an untrusted spec; on success returns a clean JSON copy and the data names to bind. */
export function validateSpec(spec: unknown): ValidateSpecResult {
  try {
    return validate(spec);
  } catch (err) {
    return { ok: false, errors: [error([], `could not be checked: ${(err as Error)?.message ?? String(err)}`)] };
  }
}

function validate(spec: unknown): ValidateSpecResult {
  if (typeof spec !== "object" || spec === null || Array.isArray(spec)) {
    return { ok: false, errors: [error([], "a spec must be a JSON object")] };
  }
  if (depthOf(spec, MAX_SPEC_DEPTH) > MAX_SPEC_DEPTH) {
    return { ok: false, errors: [error([], `the spec is nested more than ${MAX_SPEC_DEPTH} levels deep`)] };
  }
  let json: string;
  try {
    json = JSON.stringify(spec);
  } catch (err) {
    return { ok: false, errors: [error([], `the spec is not plain JSON (${(err as Error).message})`)] };
  }
  const bytes = new TextEncoder().encode(json).length;
  if (bytes > MAX_SPEC_BYTES) {
    return {
      ok: false,
      errors: [
        error([], `the spec is ${Math.ceil(bytes / 1024)} kB of JSON; the limit is ${MAX_SPEC_BYTES / 1024} kB (bind large data instead of inlining it)`),
      ],
    };
  }
  const badNumber = findNonFinite(spec);
  if (badNumber) return { ok: false, errors: [error(badNumber, "must be a finite number (NaN and Infinity are not JSON)")] };
  const clean = JSON.parse(json) as Record<string, unknown>;

  const security = checkSpecSecurity(clean);
  const errors: SpecError[] = security.issues.map((i) => error(i.path, i.message));
  const seen = new Set(errors.map((e) => e.pointer));
  for (const issue of schemaChecker()(clean)) {
    if (errors.length >= MAX_REPORTED_ERRORS) break;
    const e = error(issue.path, issue.message);
    if (!seen.has(e.pointer)) errors.push(e);
    seen.add(e.pointer);
  }
  if (errors.length) return { ok: false, errors: errors.slice(0, MAX_REPORTED_ERRORS) };
  return { ok: true, spec: clean as unknown as TopLevelSpec, dataNames: security.dataNames };
}
