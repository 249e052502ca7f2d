import path from "node:path";
import { z } from "zod";

/** The only reader of process.env. Every setting has a default that makes the embedded setup work. */
const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  PORT: z.coerce.number().int().min(1).max(65535).default(3000),
  APP_URL: z.string().url().optional(),
  DATABASE_URL: z.string().min(1).optional(),
  DATABASE_AUTH_TOKEN: z.string().optional(),
  UPLOADS_DIR: z.string().min(1).default("uploads"),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_URL: z.string().optional(),
  MAIL_SINK_DIR: z.string().min(1).default(".mail"),
  MAIL_FROM: z.string().min(3).default("Prooflight <no-reply@prooflight.localhost>"),
  AUTH_SECRET: z.string().optional(),
  UPLOAD_MAX_BYTES: z.coerce.number().int().positive().default(200 * 1024 * 1024),
  MAIL_SINK_PAGE: z.enum(["on", "off", "auto"]).default("auto"),
});

function load() {
  const parsed = schema.safeParse(process.env);
  if (!parsed.success) {
    const issues = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
    throw new Error(`Invalid environment: ${issues}`);
  }
  const e = parsed.data;
  const root = process.cwd();
  const appUrl = (e.APP_URL ?? `http://localhost:${e.PORT}`).replace(/\/$/, "");
  const smtpUrl = e.SMTP_URL ?? `smtp://127.0.0.1:${e.SMTP_PORT}`;
  const usesLocalSink = e.SMTP_URL === undefined;
  return {
    nodeEnv: e.NODE_ENV,
    port: e.PORT,
    appUrl,
    databaseUrl: e.DATABASE_URL ?? `file:${path.join(/*turbopackIgnore: true*/ root, "data", "prooflight.db")}`,
    databaseAuthToken: e.DATABASE_AUTH_TOKEN,
    uploadsDir: path.resolve(/*turbopackIgnore: true*/ root, e.UPLOADS_DIR),
    smtpUrl,
    smtpPort: e.SMTP_PORT,
    mailSinkDir: path.resolve(/*turbopackIgnore: true*/ root, e.MAIL_SINK_DIR),
    mailFrom: e.MAIL_FROM,
    authSecret: e.AUTH_SECRET,
    uploadMaxBytes: e.UPLOAD_MAX_BYTES,
    /** The outbox page shows the local sink's messages; only meaningful when mail goes there. */
    mailSinkPage: e.MAIL_SINK_PAGE === "on" || (e.MAIL_SINK_PAGE === "auto" && usesLocalSink),
    secureCookies: appUrl.startsWith("https://"),
  };
}

export type Env = ReturnType<typeof load>;

let cached: Env | undefined;
export function env(): Env {
  cached ??= load();
  return cached;
}

/** Tests point the app at a fresh database and folders; they call this after changing process.env. */
export function resetEnvForTests(): void {
  cached = undefined;
}
