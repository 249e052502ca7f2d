// Reply in a thread (Tiptap JSON body; the answer carries the sanitised HTML).
import { created, withPermission } from "@/lib/http/route";
import { replyInput } from "@/lib/server/review/schemas";
import { manuscriptOfThread, replyToThread } from "@/lib/server/review/threads";

export const POST = withPermission(
  "comment.write",
  { scope: ({ params }) => manuscriptOfThread(params.id), body: replyInput },
  async ({ user, params, body }) => created(await replyToThread(user, params.id, body)),
);
