/**
 * Locating things in JSON text. JSON.parse does not reliably say where it failed (newer V8
 * messages drop the position), so on failure a small validator finds the first bad offset;
 * and for a bad cell, `locateJsonPath` finds the offset of a value such as rows[17][2].
 */

export interface JsonSyntaxProblem {
  offset: number;
  problem: string;
}

const NUMBER = /-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/y;

function isWs(c: number): boolean {
  return c === 32 || c === 9 || c === 10 || c === 13;
}

function skipWs(text: string, i: number): number {
  while (i < text.length && isWs(text.charCodeAt(i))) i++;
  return i;
}

function describe(text: string, i: number): string {
  return i >= text.length ? "the text ends" : `unexpected ${JSON.stringify(text[i])}`;
}

/** Offset just past a string starting at `i`, or a problem. */
function scanString(text: string, i: number): number | JsonSyntaxProblem {
  for (let j = i + 1; j < text.length; j++) {
    const c = text.charCodeAt(j);
    if (c === 34) return j + 1;
    if (c < 32) return { offset: j, problem: "a line break or control character inside a string" };
    if (c === 92) {
      const e = text[j + 1];
      if (e === "u") {
        if (!/^[0-9a-fA-F]{4}$/.test(text.slice(j + 2, j + 6))) return { offset: j, problem: "a bad \\u escape" };
        j += 5;
      } else if (e !== undefined && '"\\/bfnrt'.includes(e)) j++;
      else return { offset: j, problem: "a bad escape sequence" };
    }
  }
  return { offset: i, problem: "a string that is never closed" };
}

type State = "value" | "firstValue" | "key" | "firstKey" | "after";

/** First syntax problem in `text`, or null when it is valid JSON. */
export function findJsonSyntaxError(text: string): JsonSyntaxProblem | null {
  const stack: string[] = [];
  let state: State = "value";
  let i = 0;
  for (;;) {
    i = skipWs(text, i);
    if (i >= text.length) {
      return state === "after" && stack.length === 0 ? null : { offset: i, problem: "the text ends before the JSON is complete" };
    }
    const ch = text[i];
    if (state === "after") {
      const top = stack[stack.length - 1];
      if (top === undefined) return { offset: i, problem: `${describe(text, i)} after the end of the JSON value` };
      if (ch === ",") state = top === "[" ? "value" : "key";
      else if (ch === (top === "[" ? "]" : "}")) stack.pop();
      else return { offset: i, problem: `${describe(text, i)} (expected "," or "${top === "[" ? "]" : "}"}")` };
      i++;
    } else if (state === "key" || state === "firstKey") {
      if (ch === "}" && state === "firstKey") {
        stack.pop();
        state = "after";
        i++;
        continue;
      }
      if (ch !== '"') return { offset: i, problem: `${describe(text, i)} (expected a quoted name)` };
      const end = scanString(text, i);
      if (typeof end !== "number") return end;
      i = skipWs(text, end);
      if (text[i] !== ":") return { offset: i, problem: `${describe(text, i)} (expected ":")` };
      i++;
      state = "value";
    } else {
      if (ch === "]" && state === "firstValue") {
        stack.pop();
        state = "after";
        i++;
      } else if (ch === "{" || ch === "[") {
        stack.push(ch);
        state = ch === "{" ? "firstKey" : "firstValue";
        i++;
      } else if (ch === '"') {
        const end = scanString(text, i);
        if (typeof end !== "number") return end;
        i = end;
        state = "after";
      } else {
        NUMBER.lastIndex = i;
        const lit = ["true", "false", "null"].find((w) => text.startsWith(w, i));
        if (lit) i += lit.length;
        else if (NUMBER.test(text)) i = NUMBER.lastIndex;
        else return { offset: i, problem: `${describe(text, i)} (expected a value)` };
        state = "after";
      }
    }
  }
}

/** Offset just past the (valid) JSON value starting at `i`. */
function skipValue(text: string, i: number): number {
  const c = text[i];
  if (c === '"') return scanString(text, i) as number;
  if (c !== "[" && c !== "{") {
    while (i < text.length && !",]}".includes(text[i]) && !isWs(text.charCodeAt(i))) i++;
    return i;
  }
  let depth = 0;
  while (i < text.length) {
    const d = text[i];
    if (d === '"') {
      i = scanString(text, i) as number;
      continue;
    }
    if (d === "[" || d === "{") depth++;
    else if (d === "]" || d === "}") {
      depth--;
      if (depth === 0) return i + 1;
    }
    i++;
  }
  return i;
}

/** Offset of the value at `path` (array indices and object keys) in valid JSON text; -1 if absent. */
export function locateJsonPath(text: string, path: Array<string | number>): number {
  let i = skipWs(text, 0);
  for (const step of path) {
    const open = text[i];
    if (open !== (typeof step === "number" ? "[" : "{")) return -1;
    i = skipWs(text, i + 1);
    let index = 0;
    for (;;) {
      if (text[i] === "]" || text[i] === "}" || i >= text.length) return -1;
      if (typeof step === "string") {
        const end = scanString(text, i) as number;
        const key = JSON.parse(text.slice(i, end)) as string;
        i = skipWs(text, skipWs(text, end) + 1);
        if (key === step) break;
      } else if (index === step) break;
      i = skipWs(text, skipValue(text, i));
      if (text[i] === ",") i = skipWs(text, i + 1);
      index++;
    }
  }
  return i;
}

/** 1-based line and column of an offset. */
export function lineColumnAt(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  const end = Math.min(offset, text.length);
  for (let i = 0; i < end; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: end - lineStart + 1 };
}
