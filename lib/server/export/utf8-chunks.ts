/**
 * Builds a large UTF-8 file from many small pieces of text, encoding about every megabyte, so a
 * million-row CSV or JSON file is held once, as bytes, rather than as a string and again as bytes.
 */
const FLUSH_CHARS = 1 << 20;

export class Utf8Chunks {
  private readonly done: Uint8Array[] = [];
  private pending: string[] = [];
  private pendingChars = 0;
  private readonly encoder = new TextEncoder();

  push(text: string): void {
    this.pending.push(text);
    this.pendingChars += text.length;
    if (this.pendingChars >= FLUSH_CHARS) this.flush();
  }

  private flush(): void {
    if (this.pending.length) this.done.push(this.encoder.encode(this.pending.join("")));
    this.pending = [];
    this.pendingChars = 0;
  }

  /** The whole file as one byte array. */
  bytes(): Uint8Array {
    this.flush();
    const out = new Uint8Array(this.done.reduce((n, c) => n + c.byteLength, 0));
    let at = 0;
    for (const c of this.done) {
      out.set(c, at);
      at += c.byteLength;
    }
    this.done.length = 0;
    return out;
  }
}
