import { ensureLocalEnv } from "./lib/local-env";
ensureLocalEnv();

const { applyMigrations } = await import("@/db/migrate");
const { seedDemoWithData } = await import("@/lib/server/demo/seed-demo");
await applyMigrations();
const { filesAdded, storyTold } = await seedDemoWithData();
console.log(`Demo data seeded (${filesAdded} measurement files added${storyTold ? ", the review story told" : ""}).`);
