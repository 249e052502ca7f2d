// Reply in a thread (Tiptap JSON body; the answer carries the sanitised HTML): the whole thread, or
// with `Prefer: return=minimal` only the new comment (the thread grows with every reply).
import { withPermission } from "@/lib/http/route";
import { preferenceHeaders, prefersMinimal } from "@/lib/http/prefer";
import { replyInput } from "@/lib/server/review/schemas";
import { manuscriptOfThread, postReply, replyToThread } from "@/lib/server/review/threads";

export const POST = withPermission(
  "comment.write",
  { scope: ({ params }) => manuscriptOfThread(params.id), body: replyInput },
  async ({ req, user, params, body }) => {
    const minimal = prefersMinimal(req);
    const answer = minimal ? await postReply(user, params.id, body) : await replyToThread(user, params.id, body);
    return Response.json(answer, { status: 201, headers: preferenceHeaders(minimal) });
  },
);
