import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";

/** Loads `.env.local` into process.env (without overriding) and creates AUTH_SECRET there on first run. */
export function ensureLocalEnv(root = process.cwd()): void {
  const file = path.join(root, ".env.local");
  let text = fs.existsSync(file) ? fs.readFileSync(file, "utf8") : "";
  if (!/^AUTH_SECRET=/m.test(text)) {
    text += `${text && !text.endsWith("\n") ? "\n" : ""}AUTH_SECRET=${randomBytes(32).toString("base64url")}\n`;
    fs.writeFileSync(file, text, { mode: 0o600 });
    console.log("Created AUTH_SECRET in .env.local");
  }
  for (const line of text.split("\n")) {
    const m = /^([A-Z0-9_]+)=(.*)$/.exec(line.trim());
    if (m && process.env[m[1]] === undefined) process.env[m[1]] = m[2].replace(/^"(.*)"$/, "$1");
  }
}
