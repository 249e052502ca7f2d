// Readiness probe: 200 once the database answers and every migration is applied.
import { migrationsAreApplied } from "@/db/migrate";
import { publicRoute } from "@/lib/http/route";

export const dynamic = "force-dynamic";

export const GET = publicRoute(async () => {
  const ok = await migrationsAreApplied();
  return Response.json(ok ? { ok: true } : { ok: false, reason: "migrations pending" }, { status: ok ? 200 : 503 });
});
