// Follow a thread's replies by mail ({ "following": true }) or stop following them ({ "following": false }).
import { withPermission } from "@/lib/http/route";
import { setThreadFollow, threadFollowInput } from "@/lib/server/review/thread-follows";
import { manuscriptOfThread } from "@/lib/server/review/threads";

export const POST = withPermission(
  "manuscript.read",
  { scope: ({ params }) => manuscriptOfThread(params.id), body: threadFollowInput },
  async ({ user, params, body }) => setThreadFollow(user, params.id, body),
);
