import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { closeDb } from "@/db/client";
import { applyMigrations } from "@/db/migrate";
import { DEMO_ACCOUNTS } from "@/lib/demo-data/accounts";
import { seedDemo } from "@/lib/server/demo/seed-demo";
import { resetEnvForTests } from "@/lib/env";
import type { RouteHandler } from "@/lib/http/route";

export type Who = "pi" | "author" | "reviewer" | "viewer" | "outsider";

/** A fresh SQLite file, uploads and mail folders per test file; the demo seed; one API token per demo user. */
export async function setupTestApp(): Promise<{ dir: string; tokens: Record<Who, string> }> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-test-"));
  Object.assign(process.env, {
    DATABASE_URL: `file:${path.join(dir, "test.db")}`,
    UPLOADS_DIR: path.join(dir, "uploads"),
    MAIL_SINK_DIR: path.join(dir, "mail"),
    AUTH_SECRET: "test-secret-test-secret-test-secret-0123",
    SMTP_PORT: String(20_000 + Math.floor(Math.random() * 20_000)),
  });
  delete process.env.SMTP_URL;
  resetEnvForTests();
  closeDb();
  await applyMigrations();
  await seedDemo();
  const { createApiToken } = await import("@/lib/server/api-tokens");
  const tokens = {} as Record<Who, string>;
  for (const a of DEMO_ACCOUNTS) {
    const who = a.email.split("@")[0] as Who;
    tokens[who] = (await createApiToken({ id: a.id, email: a.email, name: a.name }, { name: "test" })).token;
  }
  return { dir, tokens };
}

export interface CallOptions {
  method?: string;
  path?: string;
  token?: string | null;
  params?: Record<string, string>;
  body?: unknown;
  headers?: Record<string, string>;
  rawBody?: BodyInit;
}

/** Calls a route handler the way Next does: a Request plus a promise of params. */
export async function call(handler: RouteHandler | undefined, o: CallOptions = {}) {
  if (!handler) throw new Error("no handler exported");
  const headers = new Headers(o.headers);
  if (o.token) headers.set("authorization", `Bearer ${o.token}`);
  let body: BodyInit | undefined = o.rawBody;
  if (o.rawBody instanceof FormData) headers.delete("content-type");
  if (o.body !== undefined) {
    body = typeof o.body === "string" ? o.body : JSON.stringify(o.body);
    headers.set("content-type", "application/json");
  }
  const req = new Request(`http://localhost:3000${o.path ?? "/api/x"}`, { method: o.method ?? "GET", headers, body });
  const res = await handler(req, { params: Promise.resolve(o.params ?? {}) });
  const text = await res.text();
  let json: any = null;
  try {
    json = text ? JSON.parse(text) : null;
  } catch {
    json = text;
  }
  return { status: res.status, json, headers: res.headers };
}

/** A multipart upload body as a browser or curl would send it. */
export function uploadForm(fileName: string, content: string | Uint8Array, fields: Record<string, string> = {}): FormData {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  form.set("file", new Blob([content as BlobPart]), fileName);
  return form;
}
