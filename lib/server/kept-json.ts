import { gzipSync } from "node:zlib";

/**
 * A JSON answer kept in memory between requests while what it shows is unchanged: serialised
 * once, and gzip-compressed once, the first time a client asks for that.
 */
export class KeptJson {
  #gzip?: Uint8Array<ArrayBuffer>;
  constructor(readonly text: string) {}
  get gzip(): Uint8Array<ArrayBuffer> {
    return (this.#gzip ??= gzipSync(this.text));
  }
}
