import { ensureLocalEnv } from "./lib/local-env";
ensureLocalEnv();

const { getDb, closeDb } = await import("@/db/client");
const { verifyAuditChain } = await import("@/lib/server/audit");
const result = await verifyAuditChain(getDb());
closeDb();
if (result.ok) {
  console.log(`Audit log intact: ${result.count} entries, every link and hash matches.`);
} else {
  console.error(`Audit log broken at entry ${result.seq}: ${result.reason}.`);
  process.exit(1);
}
