import { ensureLocalEnv } from "./lib/local-env";
ensureLocalEnv();
import { closeDb } from "@/db/client";
import { applyMigrations } from "@/db/migrate";
import { createApiToken } from "@/lib/server/api-tokens";
import { findUserByEmail } from "@/lib/server/users";

const email = process.argv[2];
if (!email) {
  console.error("Usage: npm run token -- <email>");
  process.exit(2);
}
await applyMigrations();
const user = await findUserByEmail(email);
if (!user) {
  console.error(`No account with the e-mail ${email}.`);
  process.exit(1);
}
const { token } = await createApiToken(user, { name: `command line ${new Date().toISOString().slice(0, 10)}` });
console.log(token);
closeDb();
