import "server-only";
import packageJson from "@/package.json";

/** The software that parses, fits and draws, named with the versions this build pins (package.json). */
export const SOFTWARE = {
  prooflight: { name: "Prooflight", version: packageJson.version },
  vega: { name: "Vega", version: packageJson.dependencies.vega },
  vegaLite: { name: "Vega-Lite", version: packageJson.dependencies["vega-lite"] },
} as const;
