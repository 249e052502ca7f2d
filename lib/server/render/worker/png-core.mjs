/**
 * SVG → PNG with resvg at print resolution, using only the shipped TTFs (system fonts off, so the
 * pixels are the same on every machine), with a pHYs chunk carrying the resolution; and the print
 * rasters (PNG, LZW TIFF) written by sharp as RGB or greyscale, flattened onto white without an
 * alpha channel (journals' figure checks refuse transparency in raster art). Plain JavaScript: the
 * print rasters are drawn in the render worker, thumbnails in the server.
 */
import { Resvg } from "@resvg/resvg-js";
import sharp from "sharp";
import { FONT_FAMILY, fontFiles } from "./fonts-core.mjs";
import { RenderError } from "./render-error.mjs";

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
function crc32(bytes) {
  let c = 0xffffffff;
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type, data) {
  const head = Buffer.alloc(8);
  head.writeUInt32BE(data.length, 0);
  head.write(type, 4, "latin1");
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(Buffer.concat([head.subarray(4), data])), 0);
  return Buffer.concat([head, data, crc]);
}

/** Pixels per metre for a resolution in dpi (PNG stores resolution per metre). */
const pixelsPerMetre = (dpi) => Math.round(dpi / 0.0254);

/** Returns the PNG with its pHYs chunk (pixels per metre, both axes) set to `dpi`, replacing any other, and the given tEXt chunks. */
export function setPngDpi(png, dpi, text = {}) {
  if (!png.subarray(0, 8).equals(PNG_SIGNATURE)) throw new RenderError("render-failed", "not a PNG");
  const data = Buffer.alloc(9);
  data.writeUInt32BE(pixelsPerMetre(dpi), 0);
  data.writeUInt32BE(pixelsPerMetre(dpi), 4);
  data.writeUInt8(1, 8); // unit: metre
  const parts = [PNG_SIGNATURE];
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

/** Rasterises a (safe) SVG `widthMm` wide at `dpi`: pixel width = widthMm / 25.4 × dpi. */
export function svgToPngCore(svg, { dpi, widthMm, text }) {
  if (!Number.isFinite(dpi) || dpi < 30 || dpi > 2400) throw new RenderError("bad-size", "dpi must be between 30 and 2400");
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
  return { png: setPngDpi(image.asPng(), dpi, text), widthPx: image.width, heightPx: image.height, dpi };
}

/**
 * A print raster: PNG (pHYs and a Description tEXt chunk) or TIFF (LZW, lossless, resolution in
 * pixels per inch; sharp cannot set the ImageDescription tag, the draft mark is in the pixels).
 */
export async function printRasterCore(svg, { format, dpi, colour, widthMm, description }) {
  const drawn = svgToPngCore(svg, { dpi, widthMm });
  const flat = sharp(drawn.png).flatten({ background: "#ffffff" });
  const image = colour === "grey" ? flat.toColourspace("b-w") : flat.toColourspace("srgb");
  if (format === "png") {
    const { data, info } = await image.png({ compressionLevel: 9 }).toBuffer({ resolveWithObject: true });
    const text = description ? { Description: description } : undefined;
    return { bytes: new Uint8Array(setPngDpi(data, dpi, text)), widthPx: drawn.widthPx, heightPx: drawn.heightPx, channels: info.channels };
  }
  const perMm = dpi / 25.4;
  const { data, info } = await image
    .tiff({ compression: "lzw", predictor: "horizontal", xres: perMm, yres: perMm, resolutionUnit: "inch" })
    .toBuffer({ resolveWithObject: true });
  return { bytes: new Uint8Array(data), widthPx: drawn.widthPx, heightPx: drawn.heightPx, channels: info.channels };
}
