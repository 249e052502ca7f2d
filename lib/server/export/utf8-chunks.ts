/**
 * A large UTF-8 file made from many small pieces of text, encoded every 64 K characters as it is
 * read, so a million-row CSV or JSON file is never held whole, neither as a string nor as bytes.
 */
const BLOCK_CHARS = 1 << 16;

export function* utf8Blocks(pieces: Iterable<string>): Generator<Uint8Array> {
  const encoder = new TextEncoder();
  let pending: string[] = [];
  let chars = 0;
  for (const piece of pieces) {
    pending.push(piece);
    chars += piece.length;
    if (chars >= BLOCK_CHARS) {
      yield encoder.encode(pending.join(""));
      pending = [];
      chars = 0;
    }
  }
  if (pending.length) yield encoder.encode(pending.join(""));
}

/** The blocks as one byte array (small files, tests). */
export function joinBlocks(blocks: Iterable<Uint8Array>): Uint8Array {
  const parts = [...blocks];
  const out = new Uint8Array(parts.reduce((n, c) => n + c.byteLength, 0));
  let at = 0;
  for (const c of parts) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}
