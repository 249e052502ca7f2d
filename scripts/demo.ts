import { ensureLocalEnv } from "./lib/local-env";
ensureLocalEnv();

const { applyMigrations } = await import("@/db/migrate");
const { DEMO_ACCOUNTS, DEMO_PASSWORD } = await import("@/lib/demo-data/accounts");
const { seedDemoWithData } = await import("@/lib/server/demo/seed-demo");
const { env } = await import("@/lib/env");
const { startMailSink } = await import("@/lib/server/mail/sink-server");
const { buildIsStale, runNextSync, spawnNext, waitForHttp } = await import("./lib/processes");
const { closeDb } = await import("@/db/client");

// The sink first: the mails the demo story sends while it is seeded land in it straight away.
try {
  await startMailSink({ port: env().smtpPort, dir: env().mailSinkDir });
  console.log(`Mail sink: smtp://127.0.0.1:${env().smtpPort} → ${env().mailSinkDir}`);
} catch (err) {
  console.warn(`Mail sink NOT started: ${(err as Error).message}`);
}

await applyMigrations();
const seedStart = performance.now();
const seeded = await seedDemoWithData();
closeDb();
console.log(
  `Database migrated and demo data seeded (${seeded.filesAdded} files added${seeded.storyTold ? ", the review story told" : ""}) in ${((performance.now() - seedStart) / 1000).toFixed(1)} s.`,
);

if (process.argv.includes("--rebuild") || buildIsStale()) {
  console.log("Building the application (next build)…");
  await runNextSync(["build"]);
}

// A demo instance: the mail outbox page is served, to requests from this machine only.
spawnNext(["start", "-p", String(env().port)], { PROOFLIGHT_INSTANCE: "demo" });
await waitForHttp(`http://localhost:${env().port}/api/health`, 90_000);

console.log(`
Prooflight is running at ${env().appUrl} — a DEMO instance.
Mail outbox (this machine only): ${env().appUrl}/dev/mail
  It shows every sign-in link and invitation the app sends: keep a demo off shared networks.
  A lab's own instance runs \`npm run build && npm start\` with SMTP_URL set; it has no outbox page.

Demo accounts (password for all: ${DEMO_PASSWORD}):
${DEMO_ACCOUNTS.map((a) => `  ${a.email.padEnd(34)} ${a.role ?? "no membership (second lab only)"}`).join("\n")}

Press Ctrl+C to stop.`);
