import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

/** lib/figures runs in the browser and on the server: it imports no framework, database, server code or Node API. */
const FORBIDDEN = [
  /^next(\/|$)/,
  /^react(-dom)?(\/|$)/,
  /^@\/db\//,
  /^@\/lib\/server\//,
  /^@\/app\//,
  /^node:/,
  /^(fs|path|child_process|worker_threads)$/,
  /^vega$/,
  /^vega-(?!lite)/,
];

function sources(dir: string): string[] {
  return fs
    .readdirSync(dir, { withFileTypes: true })
    .flatMap((e) => (e.isDirectory() ? sources(path.join(dir, e.name)) : e.name.endsWith(".ts") ? [path.join(dir, e.name)] : []));
}

describe("lib/figures stays pure", () => {
  const files = sources(path.join(process.cwd(), "lib", "figures"));

  it("has the expected modules", () => {
    expect(files.length).toBeGreaterThanOrEqual(10);
  });

  for (const file of files) {
    it(path.relative(process.cwd(), file), () => {
      const text = fs.readFileSync(file, "utf8");
      const specifiers = [...text.matchAll(/^\s*(?:import|export)\b[^"']*?from\s+["']([^"']+)["']/gm)].map((m) => m[1]!);
      for (const s of specifiers)
        expect(
          FORBIDDEN.some((re) => re.test(s)),
          `${s} in ${file}`,
        ).toBe(false);
      // vega-lite only for types and its JSON schema; Vega itself stays in lib/server/render.
      for (const line of text.split("\n").filter((l) => /from\s+["']vega-lite["']/.test(l))) expect(line).toMatch(/^import type /);
    });
  }
});
