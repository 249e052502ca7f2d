import fs from "node:fs";
import path from "node:path";

const root = path.resolve(__dirname, "../..");

function walk(dir: string, out: string[] = []): string[] {
  for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) walk(p, out);
    else if (/\.(ts|tsx)$/.test(e.name)) out.push(p);
  }
  return out;
}

export const HTTP_VERBS = ["GET", "POST", "PUT", "PATCH", "DELETE", "HEAD", "OPTIONS"] as const;

/** Every app/**\/route.ts with its API path in OpenAPI style (`[id]` → `{id}`). */
export function routeFiles(): Array<{ file: string; apiPath: string }> {
  return walk(path.join(root, "app"))
    .filter((f) => path.basename(f) === "route.ts")
    .map((file) => {
      const rel = path
        .relative(path.join(root, "app"), path.dirname(file))
        .split(path.sep)
        .filter((seg) => !/^\(.*\)$/.test(seg))
        .map((seg) => seg.replace(/^\[(\w+)\]$/, "{$1}"));
      return { file, apiPath: `/${rel.join("/")}` };
    });
}

/** Every module under app/ that starts with the "use server" directive. */
export function serverActionFiles(): string[] {
  return walk(path.join(root, "app")).filter((f) => /^\s*["']use server["']/.test(fs.readFileSync(f, "utf8")));
}
