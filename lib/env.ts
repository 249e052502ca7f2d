import os from "node:os";
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
  UPLOAD_MAX_BYTES: z.coerce
    .number()
    .int()
    .positive()
    .default(200 * 1024 * 1024),
  MAIL_SINK_PAGE: z.enum(["on", "off", "auto"]).default("auto"),
  /** "demo" is set by `npm run demo`; `next dev` runs as development; anything else is production. */
  PROOFLIGHT_INSTANCE: z.enum(["demo", "development", "production"]).optional(),
  /** Comma-separated addresses of reverse proxies whose X-Forwarded-For is believed. */
  TRUSTED_PROXIES: z.string().default(""),
  /** A stalled upload is aborted after this many milliseconds without a byte. */
  UPLOAD_IDLE_TIMEOUT_MS: z.coerce.number().int().positive().default(60_000),
  /** Stored files no version references are removed once they are older than this (ms); it must outlast any upload. */
  ORPHAN_GRACE_MS: z.coerce.number().int().min(60_000, "ORPHAN_GRACE_MS must be at least 60000 (one minute)").default(3_600_000),
  /** The ingest child's heap cap, MB: an upload that needs more to parse is refused with 413. */
  INGEST_HEAP_MB: z.coerce.number().int().min(16).default(1024),
  /** The ingest child's wall-clock budget for one file, ms: a longer parse is refused with 422. */
  INGEST_TIMEOUT_MS: z.coerce.number().int().positive().default(120_000),
  /** Worker threads of the batch fit pool; one per core when unset. */
  FIT_WORKERS: z.coerce.number().int().min(1).max(64).optional(),
  UPLOADS_PER_USER: z.coerce.number().int().positive().default(2),
  UPLOADS_IN_TOTAL: z.coerce.number().int().positive().default(4),
  JSON_BODY_MAX_BYTES: z.coerce
    .number()
    .int()
    .positive()
    .default(1024 * 1024),
  COMMENTS_PER_MINUTE: z.coerce.number().int().positive().default(30),
  /** Review notices to one person within this many seconds of the first go out as one mail. */
  MAIL_COALESCE_SECONDS: z.coerce.number().int().min(0).max(86_400).default(60),
  /** How often each instance's digest scheduler looks for due digests, seconds. */
  DIGEST_INTERVAL_SECONDS: z.coerce.number().int().min(1).max(3600).default(60),
  /** This instance's name in its greeting to the mail relay (EHLO): a fully qualified host name for relays that insist. */
  INSTANCE_NAME: z
    .string()
    .regex(/^[A-Za-z0-9][A-Za-z0-9.-]{0,62}$/, "INSTANCE_NAME must be a host-style name: letters, digits, dots and hyphens, up to 63")
    .optional(),
  /** Where uploaded files live: the uploads folder on this machine, or an S3-compatible bucket shared by every instance. */
  STORAGE: z.enum(["local", "s3"], { message: "STORAGE must be local or s3" }).default("local"),
  S3_ENDPOINT: z.url({ protocol: /^https?$/, message: "S3_ENDPOINT must be a URL such as http://127.0.0.1:9000 (leave it unset for AWS itself)" }).optional(),
  S3_REGION: z.string().min(1).default("us-east-1"),
  S3_BUCKET: z
    .string()
    .regex(/^[a-z0-9][a-z0-9.-]{1,61}[a-z0-9]$/, "S3_BUCKET must be a bucket name: 3 to 63 lower-case letters, digits, dots or hyphens")
    .optional(),
  S3_ACCESS_KEY_ID: z.string().min(1).optional(),
  S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
  S3_FORCE_PATH_STYLE: z.enum(["true", "false", "1", "0"], { message: "S3_FORCE_PATH_STYLE must be true or false" }).default("false"),
});

/** With STORAGE=s3 the bucket and both keys must be given: an instance must never fall back to local disk unnoticed. */
const checked = schema.superRefine((e, ctx) => {
  if (e.STORAGE !== "s3") return;
  for (const key of ["S3_BUCKET", "S3_ACCESS_KEY_ID", "S3_SECRET_ACCESS_KEY"] as const)
    if (!e[key]) ctx.addIssue({ code: "custom", path: [key], message: `required when STORAGE=s3` });
});

function load() {
  const parsed = checked.safeParse(process.env);
  if (!parsed.success) {
    const issues = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
    throw new Error(`Invalid environment: ${issues}`);
  }
  const e = parsed.data;
  const root = process.cwd();
  const appUrl = (e.APP_URL ?? `http://localhost:${e.PORT}`).replace(/\/$/, "");
  const smtpUrl = e.SMTP_URL ?? `smtp://127.0.0.1:${e.SMTP_PORT}`;
  const usesLocalSink = e.SMTP_URL === undefined;
  const instance = e.PROOFLIGHT_INSTANCE ?? (e.NODE_ENV === "development" ? "development" : "production");
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
    instance,
    usesLocalSink,
    /**
     * Who may read the local sink's messages at /dev/mail: "loopback" (demo and development
     * instances, anonymous requests from this machine only), "members" (production with
     * MAIL_SINK_PAGE=on: signed-in lab members, their own mail only) or nobody.
     */
    mailSinkPage: mailSinkAudience(e.MAIL_SINK_PAGE, instance, usesLocalSink),
    trustedProxies: e.TRUSTED_PROXIES.split(",")
      .map((a) => a.trim())
      .filter(Boolean),
    uploadIdleTimeoutMs: e.UPLOAD_IDLE_TIMEOUT_MS,
    orphanGraceMs: e.ORPHAN_GRACE_MS,
    ingestHeapMb: e.INGEST_HEAP_MB,
    ingestTimeoutMs: e.INGEST_TIMEOUT_MS,
    fitWorkers: e.FIT_WORKERS ?? Math.max(1, os.availableParallelism()),
    uploadsPerUser: e.UPLOADS_PER_USER,
    uploadsInTotal: e.UPLOADS_IN_TOTAL,
    jsonBodyMaxBytes: e.JSON_BODY_MAX_BYTES,
    commentsPerMinute: e.COMMENTS_PER_MINUTE,
    mailCoalesceMs: e.MAIL_COALESCE_SECONDS * 1000,
    digestIntervalMs: e.DIGEST_INTERVAL_SECONDS * 1000,
    storage: storageSettings(e),
    /** Unset: nodemailer's own choice (the host name when it is fully qualified, else [127.0.0.1]), which strict relays accept. */
    instanceName: e.INSTANCE_NAME,
    secureCookies: appUrl.startsWith("https://"),
  };
}

type StorageSettings =
  { kind: "local" } | { kind: "s3"; endpoint?: string; region: string; bucket: string; accessKeyId: string; secretAccessKey: string; forcePathStyle: boolean };

function storageSettings(e: z.infer<typeof schema>): StorageSettings {
  if (e.STORAGE === "local") return { kind: "local" };
  return {
    kind: "s3",
    endpoint: e.S3_ENDPOINT,
    region: e.S3_REGION,
    bucket: e.S3_BUCKET!,
    accessKeyId: e.S3_ACCESS_KEY_ID!,
    secretAccessKey: e.S3_SECRET_ACCESS_KEY!,
    forcePathStyle: e.S3_FORCE_PATH_STYLE === "true" || e.S3_FORCE_PATH_STYLE === "1",
  };
}

export type MailSinkAudience = "loopback" | "members" | "nobody";

function mailSinkAudience(setting: "on" | "off" | "auto", instance: string, usesLocalSink: boolean): MailSinkAudience {
  if (setting === "off") return "nobody";
  if (instance !== "production") return setting === "on" || usesLocalSink ? "loopback" : "nobody";
  return setting === "on" ? "members" : "nobody";
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
