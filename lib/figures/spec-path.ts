/** Paths into a spec, written the way people read them ("layer[1].encoding.href") and as JSON Pointers. */

export type SpecPath = ReadonlyArray<string | number>;

/** `layer[1].encoding.href`; keys that are not plain identifiers are bracketed; the root is "(root)". */
export function formatPath(path: SpecPath): string {
  let out = "";
  for (const seg of path) {
    if (typeof seg === "number") out += `[${seg}]`;
    else if (/^[A-Za-z_$][A-Za-z0-9_$]*$/.test(seg)) out += out ? `.${seg}` : seg;
    else out += `[${JSON.stringify(seg)}]`;
  }
  return out || "(root)";
}

/** RFC 6901 JSON Pointer, for editors that map errors to positions. */
export function toPointer(path: SpecPath): string {
  return path.map((seg) => `/${String(seg).replace(/~/g, "~0").replace(/\//g, "~1")}`).join("");
}
