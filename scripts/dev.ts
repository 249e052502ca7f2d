import { ensureLocalEnv } from "./lib/local-env";
ensureLocalEnv();

const { applyMigrations } = await import("@/db/migrate");
const { seedDemoWithData } = await import("@/lib/server/demo/seed-demo");
const { env } = await import("@/lib/env");
const { startMailSink } = await import("@/lib/server/mail/sink-server");
const { spawnNext } = await import("./lib/processes");

await applyMigrations();
await seedDemoWithData();
try {
  await startMailSink({ port: env().smtpPort, dir: env().mailSinkDir });
  console.log(`Mail sink: smtp://127.0.0.1:${env().smtpPort} → ${env().mailSinkDir}`);
} catch (err) {
  console.warn(`Mail sink NOT started: ${(err as Error).message}`);
}
spawnNext(["dev", "-p", String(env().port)]);
