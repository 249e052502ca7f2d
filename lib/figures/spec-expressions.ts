/**
 * Static check of Vega expression strings written by collaborators (calculate, filter, expr,
 * test, labelExpr, signal, update, toggle …). Vega's own sandbox has been escaped repeatedly
 * (event.view → window, functions taking callable arguments, toString gadgets), so we accept only
 * a conservative subset: literals, operators, `datum` and field access, the spec's own parameter
 * names, and an allow-list of pure functions. Anything else is refused before the spec is stored.
 */

/** Pure Vega expression functions (maths, strings, dates, arrays, formatting, colours, statistics). */
const ALLOWED_FUNCTIONS: ReadonlySet<string> = new Set([
  // maths
  "abs",
  "acos",
  "asin",
  "atan",
  "atan2",
  "ceil",
  "clamp",
  "cos",
  "exp",
  "floor",
  "hypot",
  "log",
  "max",
  "min",
  "pow",
  "random",
  "round",
  "sin",
  "sqrt",
  "tan",
  "isNaN",
  "isFinite",
  "if",
  // statistics
  "sampleNormal",
  "cumulativeNormal",
  "densityNormal",
  "quantileNormal",
  "sampleLogNormal",
  "cumulativeLogNormal",
  "densityLogNormal",
  "quantileLogNormal",
  "sampleUniform",
  "cumulativeUniform",
  "densityUniform",
  "quantileUniform",
  // types
  "isArray",
  "isBoolean",
  "isDate",
  "isDefined",
  "isNumber",
  "isObject",
  "isString",
  "isValid",
  "toBoolean",
  "toDate",
  "toNumber",
  "toString",
  // dates
  "now",
  "datetime",
  "date",
  "day",
  "dayofyear",
  "year",
  "quarter",
  "month",
  "week",
  "hours",
  "minutes",
  "seconds",
  "milliseconds",
  "time",
  "timezoneoffset",
  "utc",
  "utcdate",
  "utcday",
  "utcdayofyear",
  "utcyear",
  "utcquarter",
  "utcmonth",
  "utcweek",
  "utchours",
  "utcminutes",
  "utcseconds",
  "utcmilliseconds",
  "timeOffset",
  "utcOffset",
  // arrays and strings
  "extent",
  "clampRange",
  "indexof",
  "inrange",
  "join",
  "lastindexof",
  "length",
  "lerp",
  "peek",
  "reverse",
  // not sequence() or pad(): one call with a huge count hangs or exhausts a reviewer's browser
  "slice",
  "sort",
  "span",
  "parseFloat",
  "parseInt",
  "lower",
  "upper",
  "substring",
  "split",
  "trim",
  "truncate",
  "replace",
  // formatting
  "format",
  "timeFormat",
  "timeParse",
  "utcFormat",
  "utcParse",
  "monthFormat",
  "monthAbbrevFormat",
  "dayFormat",
  "dayAbbrevFormat",
  "timeUnitSpecifier",
  // colours
  "rgb",
  "hsl",
  "lab",
  "hcl",
  "luminance",
  "contrast",
]);

/** Constants of the Vega expression language. */
const ALLOWED_CONSTANTS: ReadonlySet<string> = new Set([
  "NaN",
  "E",
  "LN2",
  "LN10",
  "LOG2E",
  "LOG10E",
  "PI",
  "SQRT1_2",
  "SQRT2",
  "MIN_VALUE",
  "MAX_VALUE",
  "true",
  "false",
  "null",
]);

/** Names always readable: the current row, and the view size signals Vega-Lite defines. */
const ALLOWED_NAMES = new Set(["datum", "width", "height"]);

/**
 * Property names that lead out of plain data (prototype chains, callables, the DOM). Refused after
 * `.`, inside `[...]`, as object-literal keys, and as field names.
 */
const FORBIDDEN_PROPERTIES: ReadonlySet<string> = new Set([
  "constructor",
  "__proto__",
  "prototype",
  "__defineGetter__",
  "__defineSetter__",
  "__lookupGetter__",
  "__lookupSetter__",
  "call",
  "apply",
  "bind",
  "caller",
  "callee",
  "arguments",
  "toString",
  "valueOf",
  "toLocaleString",
  "hasOwnProperty",
  "isPrototypeOf",
  "propertyIsEnumerable",
  "ownerDocument",
  "defaultView",
  "contentWindow",
  "view",
  "target",
  "currentTarget",
  "srcElement",
  "window",
  "document",
  "globalThis",
  "self",
  "top",
  "parent",
  "frames",
  "opener",
  "eval",
  "Function",
  "setTimeout",
  "setInterval",
  "importScripts",
  "innerHTML",
  "outerHTML",
  "cookie",
  "localStorage",
  "VEGA_DEBUG",
]);

/** Globals and keywords that are never part of a figure expression; named in the error when met. */
const REFUSED_NAMES = new Set([
  "this",
  "new",
  "function",
  "class",
  "import",
  "export",
  "eval",
  "Function",
  "window",
  "document",
  "event",
  "globalThis",
  "self",
  "top",
  "parent",
  "setTimeout",
  "setInterval",
  "fetch",
  "XMLHttpRequest",
  "constructor",
  "__proto__",
  "prototype",
  "typeof",
  "instanceof",
  "void",
  "delete",
  "in",
  "of",
  "var",
  "let",
  "const",
  "return",
  "yield",
  "await",
  "async",
  "with",
  "debugger",
  "throw",
  "try",
  "catch",
  "while",
  "for",
  "do",
  "VEGA_DEBUG",
  "require",
  "process",
  "module",
  "undefined",
  "arguments",
]);

/**
 * Vega functions refused on purpose: scale-family functions accepted a caller-supplied "group"
 * context (GHSA-4vq7-882g-wcg4), data/selection/lasso helpers reach the dataflow or take
 * callable arguments (CVE-2025-25304, CVE-2025-66648, GHSA-w5m3-xh75-mp55), event helpers need
 * the event, regexp/test invite catastrophic backtracking in a reviewer's browser.
 */
const REFUSED_FUNCTIONS = new Set([
  "scale",
  "invert",
  "copy",
  "domain",
  "range",
  "bandwidth",
  "bandspace",
  "gradient",
  "data",
  "indata",
  "setdata",
  "modify",
  "item",
  "group",
  "xy",
  "x",
  "y",
  "inScope",
  "lassoAppend",
  "lassoPath",
  "intersectLasso",
  "vlSelectionTest",
  "vlSelectionIdTest",
  "vlSelectionResolve",
  "vlSelectionTuples",
  "regexp",
  "test",
  "merge",
  "pluck",
  "encode",
  "geoShape",
  "pathShape",
  "treePath",
  "treeAncestors",
  "containerSize",
  "screen",
  "windowSize",
  "warn",
  "info",
  "debug",
]);

const MAX_EXPRESSION_LENGTH = 2_000;

type Token =
  | { kind: "name"; value: string; at: number }
  | { kind: "string"; value: string; at: number }
  | { kind: "number"; at: number }
  | { kind: "punct"; value: string; at: number };

const PUNCTUATORS = [
  "===",
  "!==",
  "==",
  "!=",
  "<=",
  ">=",
  "&&",
  "||",
  "**",
  "<<",
  ">>>",
  ">>",
  "+",
  "-",
  "*",
  "/",
  "%",
  "!",
  "~",
  "?",
  ":",
  ",",
  ".",
  "(",
  ")",
  "[",
  "]",
  "{",
  "}",
  "<",
  ">",
  "&",
  "|",
  "^",
];
function refusedPunctuator(src: string, i: number): string | null {
  const c = src[i];
  const two = src.slice(i, i + 2);
  if (c === "`") return "template literals (backticks) are not allowed";
  if (c === ";") return "statements (;) are not allowed";
  if (two === "=>") return "arrow functions are not allowed";
  if (c === "=" && src[i + 1] !== "=") return "assignment (=) is not allowed";
  if (two === "?." && !/\d/.test(src[i + 2] ?? "")) return "optional chaining (?.) is not allowed";
  if (two === "??") return "?? is not part of Vega expressions";
  if (two === "++" || two === "--") return `${two} is not allowed`;
  return null;
}

class ExpressionError extends Error {}

function readString(src: string, start: number): { value: string; end: number } {
  const quote = src[start];
  let value = "";
  let i = start + 1;
  while (i < src.length) {
    const c = src[i];
    if (c === quote) return { value, end: i + 1 };
    if (c === "\n" || c === "\r") throw new ExpressionError("a string runs past the end of the line");
    if (c !== "\\") {
      value += c;
      i++;
      continue;
    }
    const n = src[i + 1];
    if (n === undefined || n === "\n" || n === "\r" || n === "\u2028" || n === "\u2029") {
      throw new ExpressionError("line continuations inside strings are not allowed");
    }
    if (n === "x" || n === "u") {
      const m = n === "x" ? /^[0-9a-fA-F]{2}/.exec(src.slice(i + 2)) : /^(?:[0-9a-fA-F]{4}|\{[0-9a-fA-F]{1,6}\})/.exec(src.slice(i + 2));
      if (!m) throw new ExpressionError(`malformed \\${n} escape in a string`);
      const code = parseInt(m[0].replace(/[{}]/g, ""), 16);
      if (code > 0x10ffff) throw new ExpressionError("malformed \\u escape in a string");
      value += String.fromCodePoint(code);
      i += 2 + m[0].length;
      continue;
    }
    value += ({ n: "\n", t: "\t", r: "\r", b: "\b", f: "\f", v: "\v", "0": "\0" } as Record<string, string>)[n] ?? n;
    i += 2;
  }
  throw new ExpressionError("a string is not closed");
}

function tokenize(src: string): Token[] {
  const tokens: Token[] = [];
  let i = 0;
  const operandEnded = (): boolean => {
    const t = tokens[tokens.length - 1];
    return !!t && (t.kind !== "punct" || t.value === ")" || t.value === "]" || t.value === "}");
  };
  while (i < src.length) {
    const c = src[i];
    if (/\s/.test(c)) {
      i++;
      continue;
    }
    if (c === "'" || c === '"') {
      const s = readString(src, i);
      tokens.push({ kind: "string", value: s.value, at: i });
      i = s.end;
      continue;
    }
    const num = /^(?:0[xX][0-9a-fA-F]+|(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)/.exec(src.slice(i));
    if (num && (/\d/.test(c) || (c === "." && /\d/.test(src[i + 1] ?? "")))) {
      if (/^[A-Za-z_$]/.test(src.slice(i + num[0].length))) throw new ExpressionError(`malformed number at character ${i + 1}`);
      tokens.push({ kind: "number", at: i });
      i += num[0].length;
      continue;
    }
    const name = /^[A-Za-z_$][A-Za-z0-9_$]*/.exec(src.slice(i));
    if (name) {
      tokens.push({ kind: "name", value: name[0], at: i });
      i += name[0].length;
      continue;
    }
    if (c === "/" && (src[i + 1] === "/" || src[i + 1] === "*")) throw new ExpressionError("comments are not allowed in expressions");
    if (c === "/" && !operandEnded()) throw new ExpressionError("regular expressions are not allowed in expressions");
    const refused = refusedPunctuator(src, i);
    if (refused) throw new ExpressionError(refused);
    const p = PUNCTUATORS.find((q) => src.startsWith(q, i));
    if (!p) throw new ExpressionError(`unexpected character ${JSON.stringify(c)} at character ${i + 1}`);
    tokens.push({ kind: "punct", value: p, at: i });
    i += p.length;
  }
  return tokens;
}

const isPunct = (t: Token | undefined, v: string): boolean => t?.kind === "punct" && t.value === v;

function forbiddenProperty(name: string): boolean {
  return FORBIDDEN_PROPERTIES.has(name) || name.startsWith("__");
}

/**
 * Returns null when `src` is an acceptable expression, else a message saying what is refused.
 * `names` are extra identifiers the spec defines (its parameter names).
 */
export function checkExpression(src: string, names: ReadonlySet<string> = new Set()): string | null {
  if (src.length > MAX_EXPRESSION_LENGTH) return `expression is ${src.length} characters; the limit is ${MAX_EXPRESSION_LENGTH}`;
  let tokens: Token[];
  try {
    tokens = tokenize(src);
  } catch (err) {
    if (err instanceof ExpressionError) return err.message;
    throw err;
  }
  const brackets: string[] = [];
  for (let k = 0; k < tokens.length; k++) {
    const t = tokens[k];
    const prev = tokens[k - 1];
    const next = tokens[k + 1];
    if (t.kind === "punct") {
      if (t.value === "(" || t.value === "{") brackets.push(t.value);
      if (t.value === "[") {
        const member = !!prev && (prev.kind !== "punct" || prev.value === ")" || prev.value === "]");
        if (member) {
          const lit = next;
          if (!lit || (lit.kind !== "string" && lit.kind !== "number") || !isPunct(tokens[k + 2], "]")) {
            return "computed property access must use a quoted name, e.g. datum['count rate']";
          }
          if (lit.kind === "string" && forbiddenProperty(lit.value)) return `access to "${lit.value}" is not allowed`;
        }
        brackets.push("[");
      }
      if (t.value === ")" || t.value === "]" || t.value === "}") {
        const open = brackets.pop();
        if (open !== { ")": "(", "]": "[", "}": "{" }[t.value]) return `unbalanced "${t.value}"`;
      }
      continue;
    }
    const inObject = brackets[brackets.length - 1] === "{";
    const isKey = inObject && (isPunct(prev, "{") || isPunct(prev, ",")) && isPunct(next, ":");
    if (t.kind === "string") {
      if (isKey && forbiddenProperty(t.value)) return `object key "${t.value}" is not allowed`;
      continue;
    }
    if (t.kind !== "name") continue;
    const word = t.value;
    if (isPunct(prev, ".")) {
      if (forbiddenProperty(word)) return `access to ".${word}" is not allowed`;
      continue;
    }
    if (isKey) {
      if (forbiddenProperty(word)) return `object key "${word}" is not allowed`;
      continue;
    }
    if (isPunct(next, "(")) {
      if (ALLOWED_FUNCTIONS.has(word)) continue;
      return REFUSED_FUNCTIONS.has(word) || REFUSED_NAMES.has(word) || forbiddenProperty(word)
        ? `the function "${word}" is not allowed in figure expressions`
        : `unknown function "${word}"; allowed are Vega's maths, string, date, array, format and colour functions`;
    }
    if (ALLOWED_CONSTANTS.has(word) || ALLOWED_NAMES.has(word) || (names.has(word) && !REFUSED_NAMES.has(word))) continue;
    if (REFUSED_NAMES.has(word) || forbiddenProperty(word)) return `"${word}" is not allowed in figure expressions`;
    return `unknown name "${word}"; use datum.<field> for columns or declare a parameter`;
  }
  if (brackets.length) return `"${brackets[brackets.length - 1]}" is not closed`;
  return null;
}

/** Checks a field reference ("a", "a.b", "a\\.b") for segments that reach prototypes. */
export function checkFieldName(field: string): string | null {
  const segments = field.split(/(?<!\\)[.[\]]/).map((s) => s.replace(/\\(.)/g, "$1").replace(/^["']|["']$/g, ""));
  const bad = segments.find((s) => s === "__proto__" || s === "constructor" || s === "prototype");
  return bad ? `the field name part "${bad}" is not allowed` : null;
}

/**
 * The row fields an expression reads: `datum.x` and `datum["a b"]` / `datum['a b']` (the first
 * property after `datum`; `datum.a.b` reads the column `a`). Names are the columns as written, with
 * no field-path escaping. An expression that does not tokenize reads nothing here (checkExpression
 * refuses it anyway).
 */
export function datumFields(src: string): string[] {
  let tokens: Token[];
  try {
    tokens = tokenize(src);
  } catch (err) {
    if (err instanceof ExpressionError) return [];
    throw err;
  }
  const out: string[] = [];
  for (let k = 0; k < tokens.length; k++) {
    const t = tokens[k];
    if (t.kind !== "name" || t.value !== "datum" || isPunct(tokens[k - 1], ".")) continue;
    const next = tokens[k + 1];
    const after = tokens[k + 2];
    if (isPunct(next, ".") && after?.kind === "name") out.push(after.value);
    else if (isPunct(next, "[") && after?.kind === "string" && isPunct(tokens[k + 3], "]")) out.push(after.value);
  }
  return out;
}
