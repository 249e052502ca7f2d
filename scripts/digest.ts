import { ensureLocalEnv } from "./lib/local-env";
ensureLocalEnv();

const usage = `Usage: npm run digest -- --now            build and send the digests due now (for cron)
       npm run digest -- --at <ISO time>  the same as if the clock showed that time`;
const args = process.argv.slice(2);
const at = args[0] === "--now" && args.length === 1 ? new Date() : args[0] === "--at" && args.length === 2 ? new Date(args[1]) : null;
if (!at || Number.isNaN(at.getTime())) {
  console.error(usage);
  process.exit(2);
}

const { applyMigrations } = await import("@/db/migrate");
const { closeDb } = await import("@/db/client");
const { runDigests } = await import("@/lib/server/mail/digests");
const { deliverOutbox } = await import("@/lib/server/mail/outbox");
await applyMigrations();
const r = await runDigests(at);
// Sends now what is due (a relay that is down is retried by the server's outbox worker or the next run).
const delivered = await deliverOutbox();
console.log(`Digests at ${at.toISOString()}: ${r.sent} enqueued, ${r.empty} with nothing to say, ${r.taken} already taken; ${delivered} mails delivered.`);
closeDb();
