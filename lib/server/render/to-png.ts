/**
 * SVG → PNG with resvg at print resolution, using only the shipped TTFs (Inter, Arimo) (system fonts off,
 * so the pixels are the same on every machine), with a pHYs chunk carrying the resolution.
 */
import "server-only";
import { Resvg } from "@resvg/resvg-js";
import { FONT_FAMILY, fontFiles } from "./fonts";
import { assertPrintableSvg, svgSizeMm } from "./svg-safety";
import { RenderError } from "./worker/render-error.mjs";

export interface PngOptions {
  /** Dots per inch; 300 and 600 are the journal resolutions. */
  dpi?: number;
  /** Printed width, mm (default: the SVG's own width in mm). */
  widthMm?: number;
  /** tEXt chunks (PNG spec §11.3.4.3), e.g. { Description: "…" }; Latin-1 keys and values. */
  text?: Record<string, string>;
}

export interface RenderedPng {
  png: Buffer;
  widthPx: number;
  heightPx: number;
  dpi: number;
}

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

const CRC_TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

/** CRC-32 as PNG uses it (ISO 3309, polynomial 0xEDB88320). */
function crc32(bytes: Uint8Array): number {
  let c = 0xffffffff;
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Buffer): Buffer {
  const head = Buffer.alloc(8);
  head.writeUInt32BE(data.length, 0);
  head.write(type, 4, "latin1");
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(Buffer.concat([head.subarray(4), data])), 0);
  return Buffer.concat([head, data, crc]);
}

/** Pixels per metre for a resolution in dpi (PNG stores resolution per metre). */
const pixelsPerMetre = (dpi: number): number => Math.round(dpi / 0.0254);

/** Returns the PNG with its pHYs chunk (pixels per metre, both axes) set to `dpi`, replacing any other, and the given tEXt chunks. */
export function setPngDpi(png: Buffer, dpi: number, text: Record<string, string> = {}): Buffer {
  if (!png.subarray(0, 8).equals(PNG_SIGNATURE)) throw new RenderError("render-failed", "not a PNG");
  const data = Buffer.alloc(9);
  data.writeUInt32BE(pixelsPerMetre(dpi), 0);
  data.writeUInt32BE(pixelsPerMetre(dpi), 4);
  data.writeUInt8(1, 8); // unit: metre
  const parts: Buffer[] = [PNG_SIGNATURE];
  let off = 8;
  while (off < png.length) {
    const length = png.readUInt32BE(off);
    const type = png.toString("latin1", off + 4, off + 8);
    const whole = png.subarray(off, off + 12 + length);
    if (type !== "pHYs") parts.push(whole);
    if (type === "IHDR") {
      parts.push(chunk("pHYs", data));
      for (const [key, value] of Object.entries(text)) parts.push(chunk("tEXt", Buffer.from(`${key}\0${value.replace(/[^\x20-\xff]/g, "-")}`, "latin1")));
    }
    off += 12 + length;
  }
  return Buffer.concat(parts);
}

/** Rasterises a (safe) SVG at `dpi`: pixel width = widthMm / 25.4 × dpi. */
export function svgToPng(svg: string, options: PngOptions = {}): RenderedPng {
  assertPrintableSvg(svg);
  const dpi = options.dpi ?? 300;
  if (!Number.isFinite(dpi) || dpi < 30 || dpi > 2400) throw new RenderError("bad-size", "dpi must be between 30 and 2400");
  const widthMm = options.widthMm ?? svgSizeMm(svg).widthMm;
  const width = Math.round((widthMm / 25.4) * dpi);
  if (width < 1 || width > 30_000) throw new RenderError("bad-size", `a ${width}-pixel-wide PNG is not made`);
  const resvg = new Resvg(svg, {
    fitTo: { mode: "width", value: width },
    font: { fontFiles: fontFiles(), loadSystemFonts: false, defaultFontFamily: FONT_FAMILY, sansSerifFamily: FONT_FAMILY },
    background: "white",
    shapeRendering: 2,
    textRendering: 1,
    logLevel: "off",
  });
  const image = resvg.render();
  return { png: setPngDpi(image.asPng(), dpi, options.text), widthPx: image.width, heightPx: image.height, dpi };
}
