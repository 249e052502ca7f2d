// Readiness probe: 200 once the database answers and every migration is applied.
import { readiness } from "@/lib/server/health";
import { publicRoute } from "@/lib/http/route";

export const dynamic = "force-dynamic";

export const GET = publicRoute(async () => {
  const state = await readiness();
  return Response.json(state, { status: state.ok ? 200 : 503 });
});
