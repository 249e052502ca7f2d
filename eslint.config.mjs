import js from "@eslint/js";
import tseslint from "typescript-eslint";
import drizzle from "eslint-plugin-drizzle";
import globals from "globals";

const pureCore = ["lib/analysis/**", "lib/physics/**", "lib/data/**", "lib/review/**", "lib/figures/**"];

export default tseslint.config(
  { ignores: [".next/**", "node_modules/**", "bench/results/**", "test-results/**", "playwright-report/**", ".test-work/**", "next-env.d.ts", "db/migrations/**"] },
  js.configs.recommended,
  { files: ["**/*.mjs", "scripts/**", "bench/**"], languageOptions: { globals: { ...globals.node } } },
  ...tseslint.configs.recommended,
  {
    rules: {
      "@typescript-eslint/no-explicit-any": "off",
      "@typescript-eslint/no-non-null-assertion": "off",
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
      "@typescript-eslint/ban-ts-comment": ["error", { "ts-ignore": "allow-with-description", "ts-expect-error": "allow-with-description" }],
    },
  },
  {
    // Updates and deletes always name their rows.
    files: ["lib/server/**", "lib/authz/**", "db/**", "scripts/**"],
    plugins: { drizzle },
    rules: {
      "drizzle/enforce-delete-with-where": ["error", { drizzleObjectName: ["db", "tx", "getDb()"] }],
      "drizzle/enforce-update-with-where": ["error", { drizzleObjectName: ["db", "tx", "getDb()"] }],
    },
  },
  {
    // The pure core takes and returns plain data: no framework, no database, no file system.
    files: pureCore,
    rules: {
      "no-restricted-imports": ["error", {
        patterns: [
          { group: ["next", "next/*", "react", "react-dom", "@/db/*", "@/lib/server/*", "@/app/*", "@libsql/*", "drizzle-orm", "drizzle-orm/*"], message: "The pure core must not depend on the framework or the database." },
          { group: ["node:fs", "fs", "node:fs/*", "node:stream", "node:path"], message: "The pure core takes bytes in, not files." },
        ],
      }],
    },
  },
  {
    // Only the service layer (and scripts, tests, the schema itself) may touch the database client.
    files: ["app/**", "components/**", "lib/http/**"],
    rules: {
      "no-restricted-imports": ["error", {
        paths: [{ name: "@/db/client", message: "Go through a service in lib/server." }],
        patterns: [{ group: ["drizzle-orm", "drizzle-orm/*", "@libsql/*"], message: "Go through a service in lib/server." }],
      }],
    },
  },
  {
    // Only lib/env.ts reads the environment (NEXT_RUNTIME in instrumentation is Next's own marker).
    files: ["app/**", "components/**", "lib/**", "db/**"],
    ignores: ["lib/env.ts"],
    rules: { "no-restricted-properties": ["error", { object: "process", property: "env", message: "Read settings through lib/env.ts." }] },
  },
);
