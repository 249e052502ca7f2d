import { applyMigrations } from "@/db/migrate";
import { seedDemo } from "@/db/seed";

await applyMigrations();
await seedDemo();
console.log("Demo data seeded.");
