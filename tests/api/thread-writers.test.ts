import { and, eq, isNotNull } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { notices, panels } from "@/db/schema";
import { plainDoc } from "@/lib/review/rich-text";
import { seedDemoWithData } from "@/lib/server/demo/seed-demo";
import { createThread, deleteComment, postReply } from "@/lib/server/review/threads";
import { setupTestApp } from "./harness";

/** Who hears of a reply: everyone who wrote in the thread before and whose comment still stands, never the one replying. */
const PI = { id: "demo-pi", email: "pi@lab.example.org", name: "Mira Halvorsen" };
const AUTHOR = { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg" };
const REVIEWER = { id: "demo-reviewer", email: "reviewer@partner.example.org", name: "Ines Varga" };

const repliesTo = async (userId: string) =>
  (
    await getDb()
      .select()
      .from(notices)
      .where(and(eq(notices.userId, userId), eq(notices.kind, "reply")))
  ).length;

beforeAll(async () => {
  await setupTestApp();
  await seedDemoWithData();
});

describe("reply notices in a long thread", () => {
  it("reach each earlier writer once, not the one whose only comment was deleted", async () => {
    const [panel] = await getDb().select().from(panels).where(isNotNull(panels.currentRevisionId)).limit(1);
    const thread = await createThread(REVIEWER, panel!.id, { body: plainDoc("Is the fit window right?"), revisionId: panel!.currentRevisionId! });
    // The PI writes many times: one row each for the walk, however many comments.
    for (let i = 0; i < 8; i++) await postReply(PI, thread!.id, { body: plainDoc(`look ${i}`) });
    const authorsOwn = await postReply(AUTHOR, thread!.id, { body: plainDoc("I will check.") });
    await deleteComment(AUTHOR, authorsOwn.id);
    const before = { reviewer: await repliesTo("demo-reviewer"), author: await repliesTo("demo-author"), pi: await repliesTo("demo-pi") };

    await postReply(PI, thread!.id, { body: plainDoc("Window moved to 2–40 µs.") });

    expect(await repliesTo("demo-reviewer")).toBe(before.reviewer + 1);
    expect(await repliesTo("demo-author")).toBe(before.author);
    expect(await repliesTo("demo-pi")).toBe(before.pi);
  });
});
