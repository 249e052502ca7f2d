/** The fonts shipped with the app for server drawing; defined in plain JavaScript so the render worker shares them. */
import "server-only";

export { FONT_FAMILY, fontFiles, fontPath, shippedFamily } from "./worker/fonts-core.mjs";
export type { FontFace, FontFamily } from "./worker/fonts-core.mjs";
