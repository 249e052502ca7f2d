/**
 * A small interpreting JSON-Schema (draft-07) checker for the keywords the Vega-Lite schema uses:
 * $ref (local), type, anyOf, allOf, oneOf (treated as anyOf), not, properties,
 * additionalProperties, patternProperties (ignored), required, items (schema or tuple), enum,
 * const, minimum, maximum, exclusiveMinimum/Maximum, minItems, maxItems, minLength, maxLength,
 * minProperties; annotations (description, format, $schema, default, …) are ignored.
 *
 * Why not ajv at run time: ajv compiles validators with `new Function`, which the pages'
 * Content-Security-Policy (no 'unsafe-eval') forbids in the browser. This interpreter is pure and
 * runs anywhere; ajv (a dev dependency) checks it in tests/unit/figures/json-schema-check.test.ts.
 *
 * When every branch of an anyOf fails, the errors of the branch that got furthest into the value
 * are reported (as "best match" validators do); when all branches fail at the value itself,
 * their expectations are merged into one message ("must be one of …").
 */

export interface JsonSchema {
  [keyword: string]: unknown;
}

type PathSegment = string | number;

interface SchemaIssue {
  path: PathSegment[];
  message: string;
}

interface Issue {
  path: PathSegment[];
  message: string;
  /** The value itself had the wrong type, const or enum value: a weak match for anyOf ranking. */
  shallow?: boolean;
  /** A property the schema does not know, or a required one missing: a sign of the wrong anyOf branch. */
  structural?: boolean;
  expected?: string[];
}

const IGNORED = new Set([
  "$schema",
  "$id",
  "$comment",
  "title",
  "description",
  "default",
  "examples",
  "format",
  "definitions",
  "markdownDescription",
  "deprecated",
  "readOnly",
  "writeOnly",
  "patternProperties",
  "propertyNames",
  "errorMessage",
]);
const HANDLED = new Set([
  "$ref",
  "type",
  "anyOf",
  "allOf",
  "oneOf",
  "not",
  "properties",
  "additionalProperties",
  "required",
  "items",
  "enum",
  "const",
  "minimum",
  "maximum",
  "exclusiveMinimum",
  "exclusiveMaximum",
  "minItems",
  "maxItems",
  "minLength",
  "maxLength",
  "minProperties",
  "maxProperties",
  "uniqueItems",
]);

/** Keywords present in `schema` (recursively) that this checker neither handles nor ignores. */
export function unsupportedKeywords(schema: JsonSchema): string[] {
  const found = new Set<string>();
  const walk = (s: unknown, isMap: boolean): void => {
    if (Array.isArray(s)) return s.forEach((v) => walk(v, false));
    if (!s || typeof s !== "object") return;
    for (const [k, v] of Object.entries(s)) {
      if (isMap) {
        walk(v, false);
        continue;
      }
      if (!HANDLED.has(k) && !IGNORED.has(k)) found.add(k);
      if (k === "properties" || k === "definitions" || k === "patternProperties") walk(v, true);
      else if (k !== "enum" && k !== "const" && k !== "default" && k !== "examples") walk(v, false);
    }
  };
  walk(schema, false);
  return [...found].sort();
}

function typeOf(value: unknown): string {
  if (value === null) return "null";
  if (Array.isArray(value)) return "array";
  if (typeof value === "number") return Number.isInteger(value) ? "integer" : "number";
  return typeof value;
}

function matchesType(value: unknown, type: string): boolean {
  const t = typeOf(value);
  return t === type || (type === "number" && t === "integer");
}

const ARTICLE: Record<string, string> = {
  string: "a string",
  number: "a number",
  integer: "an integer",
  boolean: "true or false",
  object: "an object",
  array: "an array",
  null: "null",
};

function show(value: unknown): string {
  const s = JSON.stringify(value);
  return s === undefined ? String(value) : s.length > 60 ? `${s.slice(0, 57)}…` : s;
}

function deepEqual(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== "object" || typeof b !== "object" || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  const ka = Object.keys(a);
  const kb = Object.keys(b);
  if (ka.length !== kb.length) return false;
  return ka.every((k) => deepEqual((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
}

function joinExpected(list: string[]): string {
  // Quoted constants first, then kinds of value ("a number", "an object").
  const unique = [...new Set(list)].sort((a, b) => Number(!a.startsWith('"')) - Number(!b.startsWith('"')));
  if (unique.length <= 1) return unique[0] ?? "something else";
  if (unique.length > 24) return `${unique.slice(0, 24).join(", ")}, …`;
  return `${unique.slice(0, -1).join(", ")} or ${unique[unique.length - 1]}`;
}

const prefix = (seg: PathSegment, issues: Issue[]): Issue[] => issues.map((i) => ({ ...i, path: [seg, ...i.path] }));
const maxDepth = (issues: Issue[]): number => Math.max(...issues.map((i) => i.path.length + (i.shallow ? 0 : 0.5)));
/** How strongly a failing anyOf branch looks like the wrong form altogether (lower is a better match). */
const mismatch = (issues: Issue[]): number => issues.filter((i) => (i.structural && i.path.length <= 1) || (i.shallow && i.path.length === 0)).length;

export type SchemaChecker = (value: unknown) => SchemaIssue[];

/** Builds a checker for `root` (a draft-07 schema whose $refs point into its own `definitions`). */
export function createSchemaChecker(root: JsonSchema): SchemaChecker {
  const refCache = new Map<string, JsonSchema>();
  const resolve = (ref: string): JsonSchema => {
    const hit = refCache.get(ref);
    if (hit) return hit;
    if (!ref.startsWith("#")) throw new Error(`only local $refs are supported: ${ref}`);
    let node: unknown = root;
    for (const raw of ref.slice(1).split("/").filter(Boolean)) {
      const key = raw.replace(/~1/g, "/").replace(/~0/g, "~");
      const obj = node as Record<string, unknown>;
      node = key in obj ? obj[key] : obj[decodeURIComponent(key)];
      if (node === undefined) throw new Error(`unresolvable $ref ${ref}`);
    }
    refCache.set(ref, node as JsonSchema);
    return node as JsonSchema;
  };

  // Results for (object or array value, schema) pairs: anyOf trees revisit the same sub-values often.
  let memo = new WeakMap<object, Map<JsonSchema, Issue[]>>();

  function check(schema: JsonSchema | boolean, value: unknown): Issue[] {
    if (schema === true) return [];
    if (schema === false) return [{ path: [], message: "is not allowed here", shallow: true, expected: [] }];
    const memoKey = typeof value === "object" && value !== null ? value : null;
    if (memoKey) {
      const hit = memo.get(memoKey)?.get(schema);
      if (hit) return hit;
    }
    const issues = checkUncached(schema, value);
    if (memoKey) {
      let m = memo.get(memoKey);
      if (!m) memo.set(memoKey, (m = new Map<JsonSchema, Issue[]>()));
      m.set(schema, issues);
    }
    return issues;
  }

  function checkUncached(s: JsonSchema, value: unknown): Issue[] {
    if (typeof s.$ref === "string") {
      const issues = check(resolve(s.$ref), value);
      const rest = Object.keys(s).some((k) => k !== "$ref" && HANDLED.has(k));
      return rest ? [...issues, ...checkUncached({ ...s, $ref: undefined }, value)] : issues;
    }
    if (s.type !== undefined) {
      const types = Array.isArray(s.type) ? (s.type as string[]) : [s.type as string];
      if (!types.some((t) => matchesType(value, t))) {
        // A typed enum or const says more than its type does.
        const listed = Array.isArray(s.enum) ? s.enum.map(show) : "const" in s ? [show(s.const)] : null;
        const expected = listed ?? types.map((t) => ARTICLE[t] ?? t);
        return [{ path: [], message: `must be ${joinExpected(expected)}`, shallow: true, expected }];
      }
    }
    if ("const" in s && !deepEqual(value, s.const)) {
      return [{ path: [], message: `must be ${show(s.const)}`, shallow: true, expected: [show(s.const)] }];
    }
    if (Array.isArray(s.enum) && !s.enum.some((e) => deepEqual(e, value))) {
      const expected = s.enum.map(show);
      return [{ path: [], message: `must be one of ${joinExpected(expected)}`, shallow: true, expected }];
    }
    const issues: Issue[] = [];
    if (typeof value === "number") checkNumber(s, value, issues);
    if (typeof value === "string") checkString(s, value, issues);
    if (Array.isArray(value)) checkArray(s, value, issues);
    else if (value !== null && typeof value === "object") checkObject(s, value as Record<string, unknown>, issues);
    if (Array.isArray(s.allOf)) for (const sub of s.allOf) issues.push(...check(sub as JsonSchema, value));
    if (s.not !== undefined && check(s.not as JsonSchema, value).length === 0) issues.push({ path: [], message: "matches a form that is not allowed" });
    const alternatives = (s.anyOf ?? s.oneOf) as JsonSchema[] | undefined;
    if (Array.isArray(alternatives)) issues.push(...checkAnyOf(alternatives, value));
    return issues;
  }

  function checkNumber(s: JsonSchema, v: number, issues: Issue[]): void {
    if (typeof s.minimum === "number" && v < s.minimum) issues.push({ path: [], message: `must be ≥ ${s.minimum}` });
    if (typeof s.maximum === "number" && v > s.maximum) issues.push({ path: [], message: `must be ≤ ${s.maximum}` });
    if (typeof s.exclusiveMinimum === "number" && v <= s.exclusiveMinimum) issues.push({ path: [], message: `must be > ${s.exclusiveMinimum}` });
    if (typeof s.exclusiveMaximum === "number" && v >= s.exclusiveMaximum) issues.push({ path: [], message: `must be < ${s.exclusiveMaximum}` });
  }

  function checkString(s: JsonSchema, v: string, issues: Issue[]): void {
    const length = [...v].length;
    if (typeof s.minLength === "number" && length < s.minLength) issues.push({ path: [], message: `must have at least ${s.minLength} characters` });
    if (typeof s.maxLength === "number" && length > s.maxLength) issues.push({ path: [], message: `must have at most ${s.maxLength} characters` });
  }

  function checkArray(s: JsonSchema, v: unknown[], issues: Issue[]): void {
    if (typeof s.minItems === "number" && v.length < s.minItems) issues.push({ path: [], message: `must have at least ${s.minItems} items` });
    if (typeof s.maxItems === "number" && v.length > s.maxItems) issues.push({ path: [], message: `must have at most ${s.maxItems} items` });
    if (Array.isArray(s.items)) {
      s.items.forEach((sub, i) => {
        if (i < v.length) issues.push(...prefix(i, check(sub as JsonSchema, v[i])));
      });
    } else if (s.items !== undefined) {
      v.forEach((item, i) => issues.push(...prefix(i, check(s.items as JsonSchema, item))));
    }
    if (s.uniqueItems === true && new Set(v.map((x) => JSON.stringify(x))).size !== v.length) issues.push({ path: [], message: "must not repeat items" });
  }

  function checkObject(s: JsonSchema, v: Record<string, unknown>, issues: Issue[]): void {
    const keys = Object.keys(v);
    if (typeof s.minProperties === "number" && keys.length < s.minProperties)
      issues.push({ path: [], message: `must have at least ${s.minProperties} properties` });
    if (typeof s.maxProperties === "number" && keys.length > s.maxProperties)
      issues.push({ path: [], message: `must have at most ${s.maxProperties} properties` });
    const props = (s.properties ?? {}) as Record<string, JsonSchema>;
    if (Array.isArray(s.required)) {
      for (const r of s.required as string[]) if (!(r in v)) issues.push({ path: [], message: `needs the property "${r}"`, structural: true });
    }
    for (const key of keys) {
      if (Object.prototype.hasOwnProperty.call(props, key)) {
        issues.push(...prefix(key, check(props[key], v[key])));
      } else if (s.additionalProperties === false) {
        issues.push({ path: [key], message: "is not a property Vega-Lite knows here", structural: true });
      } else if (s.additionalProperties !== undefined && s.additionalProperties !== true) {
        issues.push(...prefix(key, check(s.additionalProperties as JsonSchema, v[key])));
      }
    }
  }

  function checkAnyOf(alternatives: JsonSchema[], value: unknown): Issue[] {
    const failures: Issue[][] = [];
    for (const alt of alternatives) {
      const issues = check(alt, value);
      if (issues.length === 0) return [];
      failures.push(issues);
    }
    const allShallow = failures.every((f) => f.every((i) => i.shallow && i.path.length === 0));
    if (allShallow) {
      const expected = failures.flatMap((f) => f.flatMap((i) => i.expected ?? []));
      return [{ path: [], message: `must be ${joinExpected(expected)}`, shallow: true, expected }];
    }
    let best = failures[0];
    for (const f of failures.slice(1)) {
      const [m, bm] = [mismatch(f), mismatch(best)];
      const [d, bd] = [maxDepth(f), maxDepth(best)];
      if (m < bm || (m === bm && (d > bd || (d === bd && f.length < best.length)))) best = f;
    }
    return best;
  }

  return (value: unknown): SchemaIssue[] => {
    memo = new WeakMap();
    try {
      return check(root, value).map(({ path, message }) => ({ path, message }));
    } finally {
      memo = new WeakMap();
    }
  };
}
