// Resolve a thread, or reopen it with { "reopen": true }.
import { withPermission } from "@/lib/http/route";
import { resolveInput } from "@/lib/server/review/schemas";
import { manuscriptOfThread, setThreadResolved } from "@/lib/server/review/threads";

export const POST = withPermission(
  "comment.write",
  { scope: ({ params }) => manuscriptOfThread(params.id), body: resolveInput },
  async ({ user, params, body }) => setThreadResolved(user, params.id, !body.reopen),
);
