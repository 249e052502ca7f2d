// Edit one's own comment within 15 minutes (history kept) / delete it while nobody has replied.
import { withPermission } from "@/lib/http/route";
import { editCommentInput } from "@/lib/server/review/schemas";
import { deleteComment, editComment, manuscriptOfComment } from "@/lib/server/review/threads";

export const PATCH = withPermission(
  "comment.write",
  { scope: ({ params }) => manuscriptOfComment(params.id), body: editCommentInput },
  async ({ user, params, body }) => editComment(user, params.id, body),
);

export const DELETE = withPermission("comment.write", { scope: ({ params }) => manuscriptOfComment(params.id) }, async ({ user, params }) =>
  deleteComment(user, params.id),
);
