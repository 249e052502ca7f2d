import "server-only";
import { migrationsAreApplied } from "@/db/migrate";

export type Readiness = { ok: true } | { ok: false; reason: string };

/** Readiness of this instance: the database answers and every migration is applied. */
export async function readiness(): Promise<Readiness> {
  return (await migrationsAreApplied()) ? { ok: true } : { ok: false, reason: "migrations pending" };
}
