/**
 * The fonts shipped with the app for server drawing (resvg and pdfkit draw only from TTF/OTF files;
 * system fonts are never used): Inter (@expo-google-fonts/inter) and Arimo (@expo-google-fonts/arimo,
 * metric-compatible with Arial and Helvetica), resolved from the project root (process.cwd()), which
 * is where `next start`, tsx, vitest and the render worker run. Plain JavaScript: the render worker
 * draws PDF and PNG files with them too.
 */
import path from "node:path";

const FAMILIES = {
  Inter: {
    dir: ["node_modules", "@expo-google-fonts", "inter"],
    faces: {
      regular: "400Regular/Inter_400Regular.ttf",
      italic: "400Regular_Italic/Inter_400Regular_Italic.ttf",
      semibold: "600SemiBold/Inter_600SemiBold.ttf",
      bold: "700Bold/Inter_700Bold.ttf",
    },
  },
  Arimo: {
    dir: ["node_modules", "@expo-google-fonts", "arimo"],
    faces: {
      regular: "400Regular/Arimo_400Regular.ttf",
      italic: "400Regular_Italic/Arimo_400Regular_Italic.ttf",
      semibold: "600SemiBold/Arimo_600SemiBold.ttf",
      bold: "700Bold/Arimo_700Bold.ttf",
    },
  },
};

export const FONT_FAMILIES = Object.keys(FAMILIES);
export const FONT_FACES = ["regular", "italic", "semibold", "bold"];
export const FONT_FAMILY = "Inter";

/** Absolute path of one face of a shipped family. */
export function fontPath(family, face, root = process.cwd()) {
  const f = FAMILIES[family];
  return path.join(/* turbopackIgnore: true */ root, ...f.dir, ...f.faces[face].split("/"));
}

/** Absolute paths of every shipped face. */
export function fontFiles(root = process.cwd()) {
  return FONT_FAMILIES.flatMap((family) => FONT_FACES.map((face) => fontPath(family, face, root)));
}

/** The shipped family an SVG font-family list asks for first (Inter when it names none of them). */
export function shippedFamily(fontFamily) {
  const names = (fontFamily ?? "").split(",").map((n) => n.trim().replace(/^["']|["']$/g, ""));
  return names.find((n) => n in FAMILIES) ?? "Inter";
}
