import { applyMigrations } from "@/db/migrate";
import { env } from "@/lib/env";

await applyMigrations();
console.log(`Migrations applied to ${env().databaseUrl}`);
