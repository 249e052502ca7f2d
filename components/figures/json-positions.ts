/**
 * Where each value of a JSON text sits, by JSON Pointer, so validation errors (which name a
 * pointer) can be shown as inline diagnostics. Parses valid JSON only; returns null otherwise.
 */

export interface Span {
  from: number;
  to: number;
}
export interface JsonPositions {
  values: Map<string, Span>;
  keys: Map<string, Span>;
}

const escapeSeg = (s: string) => s.replace(/~/g, "~0").replace(/\//g, "~1");

export function jsonPositions(text: string): JsonPositions | null {
  const values = new Map<string, Span>();
  const keys = new Map<string, Span>();
  let i = 0;
  const ws = () => {
    while (i < text.length && /\s/.test(text[i])) i++;
  };
  const fail = (): never => {
    throw new Error("bad json");
  };

  function str(): string {
    const start = i;
    if (text[i] !== '"') fail();
    i++;
    while (i < text.length && text[i] !== '"') i += text[i] === "\\" ? 2 : 1;
    if (text[i] !== '"') fail();
    i++;
    return JSON.parse(text.slice(start, i)) as string;
  }

  function value(pointer: string) {
    ws();
    const from = i;
    const c = text[i];
    if (c === "{") {
      i++;
      ws();
      if (text[i] === "}") i++;
      else {
        for (;;) {
          ws();
          const kFrom = i;
          const key = str();
          const child = `${pointer}/${escapeSeg(key)}`;
          keys.set(child, { from: kFrom, to: i });
          ws();
          if (text[i] !== ":") fail();
          i++;
          value(child);
          ws();
          if (text[i] === ",") {
            i++;
            continue;
          }
          if (text[i] === "}") {
            i++;
            break;
          }
          fail();
        }
      }
    } else if (c === "[") {
      i++;
      ws();
      if (text[i] === "]") i++;
      else {
        for (let n = 0; ; n++) {
          value(`${pointer}/${n}`);
          ws();
          if (text[i] === ",") {
            i++;
            continue;
          }
          if (text[i] === "]") {
            i++;
            break;
          }
          fail();
        }
      }
    } else if (c === '"') str();
    else {
      const m = /^(?:-?\d+(?:\.\d+)?(?:[eE][+-]?\d+)?|true|false|null)/.exec(text.slice(i, i + 64));
      if (!m) fail();
      i += m![0].length;
    }
    values.set(pointer, { from, to: i });
  }

  try {
    value("");
    ws();
    return i === text.length ? { values, keys } : null;
  } catch {
    return null;
  }
}

/** The span of a pointer's key (or value), or of its nearest ancestor that exists in the text. */
export function spanFor(p: JsonPositions, pointer: string): Span {
  let ptr = pointer;
  for (;;) {
    if (!ptr) return { from: 0, to: 1 };
    const hit = p.keys.get(ptr) ?? p.values.get(ptr);
    if (hit) return hit;
    ptr = ptr.slice(0, ptr.lastIndexOf("/"));
  }
}
