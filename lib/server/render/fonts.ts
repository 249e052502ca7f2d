/**
 * The fonts shipped with the app for server rendering (resvg and pdfkit draw only from TTF/OTF
 * files; system fonts are never used). Inter from @expo-google-fonts/inter, resolved from the
 * project root (process.cwd()), which is where `next start`, tsx and vitest run.
 */
import "server-only";
import path from "node:path";

const INTER_DIR = ["node_modules", "@expo-google-fonts", "inter"];

const INTER_FILES = {
  regular: "400Regular/Inter_400Regular.ttf",
  italic: "400Regular_Italic/Inter_400Regular_Italic.ttf",
  semibold: "600SemiBold/Inter_600SemiBold.ttf",
  bold: "700Bold/Inter_700Bold.ttf",
} as const;

export type InterFace = keyof typeof INTER_FILES;

/** Absolute path of one Inter face. */
export function interFontPath(face: InterFace, root: string = process.cwd()): string {
  return path.join(/* turbopackIgnore: true */ root, ...INTER_DIR, ...INTER_FILES[face].split("/"));
}

/** Absolute paths of every shipped Inter face. */
export function interFontFiles(root: string = process.cwd()): string[] {
  return (Object.keys(INTER_FILES) as InterFace[]).map((f) => interFontPath(f, root));
}

export const FONT_FAMILY = "Inter";
