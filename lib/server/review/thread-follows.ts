import "server-only";
import { z } from "zod";
import { getDb } from "@/db/client";
import { threadFollows } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { appendAudit } from "../audit";
import { manuscriptOfThread } from "./threads";

export const threadFollowInput = z.strictObject({ following: z.boolean({ error: "true or false." }) });

/**
 * Whether replies in a thread reach the caller by mail: on for any member who can read it (viewers
 * too), off also for people who wrote in it. Recorded, so the choice outlives later comments.
 */
export async function setThreadFollow(user: SessionUser, threadId: string, raw: z.infer<typeof threadFollowInput>) {
  const { following } = threadFollowInput.parse(raw);
  await authorize(user, "manuscript.read", await manuscriptOfThread(threadId));
  await getDb().transaction(async (tx) => {
    await tx
      .insert(threadFollows)
      .values({ threadId, userId: user.id, following })
      .onConflictDoUpdate({ target: [threadFollows.threadId, threadFollows.userId], set: { following } });
    await appendAudit(tx, { actorId: user.id, action: following ? "thread.follow" : "thread.unfollow", target: `thread:${threadId}` });
  });
  return { threadId, following };
}
