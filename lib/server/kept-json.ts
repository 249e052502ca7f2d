import { gzipSync } from "node:zlib";

/**
 * A JSON answer kept in memory between requests while what it shows is unchanged: serialised
 * once, and gzip-compressed once, the first time a client asks for that.
 */
export class KeptJson {
  #gzip?: Uint8Array<ArrayBuffer>;
  constructor(readonly text: string) {}
  get gzip(): Uint8Array<ArrayBuffer> {
    if (!this.#gzip) {
      const z = gzipSync(this.text);
      this.#gzip = new Uint8Array(z.buffer as ArrayBuffer, z.byteOffset, z.byteLength);
    }
    return this.#gzip;
  }
}
