import "server-only";
import fs from "node:fs";
import path from "node:path";
import { env } from "@/lib/env";

export interface SinkMessage {
  id: string;
  receivedAt: string;
  envelope: { from: string | null; to: string[] };
  messageId: string | null;
  subject: string;
  text: string;
  html: string | null;
}

/** Messages the local sink received, newest first. */
export function listSinkMessages(dir = env().mailSinkDir): SinkMessage[] {
  if (!fs.existsSync(dir)) return [];
  return fs
    .readdirSync(dir)
    .filter((f) => f.endsWith(".json") && !f.startsWith("."))
    .sort()
    .reverse()
    .map((f) => JSON.parse(fs.readFileSync(path.join(dir, f), "utf8")) as SinkMessage);
}

export function getSinkMessage(id: string, dir = env().mailSinkDir): SinkMessage | null {
  if (!/^[\w-]+$/.test(id)) return null;
  const file = path.join(dir, `${id}.json`);
  return fs.existsSync(file) ? (JSON.parse(fs.readFileSync(file, "utf8")) as SinkMessage) : null;
}
