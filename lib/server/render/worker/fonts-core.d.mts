/** Types of fonts-core.mjs. */

export type FontFamily = "Inter" | "Arimo";
export type FontFace = "regular" | "italic" | "semibold" | "bold";
export declare const FONT_FAMILIES: FontFamily[];
export declare const FONT_FACES: FontFace[];
export declare const FONT_FAMILY: "Inter";
export declare function fontPath(family: FontFamily, face: FontFace, root?: string): string;
export declare function fontFiles(root?: string): string[];
export declare function shippedFamily(fontFamily: string | undefined): FontFamily;
