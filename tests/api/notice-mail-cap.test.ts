import { eq, isNull } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { mailOutbox, notices } from "@/db/schema";
import { DEMO_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { flushNotices } from "@/lib/server/mail/notices";
import { describeUnsubscribe } from "@/lib/server/mail/unsubscribe";
import { setupTestApp } from "./harness";

/** A busy thread can leave a person hundreds of notices in one window: one mail lists 50 and counts the rest. */
const APP = "http://localhost:3000";
beforeAll(async () => {
  process.env.APP_URL = APP;
  await setupTestApp();
});

describe("one mail for many notices", () => {
  it("lists the first 50, counts the other 10, links the activity page, and takes all 60", async () => {
    const t0 = Date.now() - 120_000;
    // 55 replies, then 5 approvals: the approvals fall past the 50 listed, and the mail's unsubscribe still names them.
    const rows = Array.from({ length: 60 }, (_, i) => ({
      id: `cap-${String(i).padStart(2, "0")}`,
      userId: "demo-reviewer",
      kind: i < 55 ? "reply" : "approved",
      manuscriptId: DEMO_MANUSCRIPT_ID,
      subject: `Update ${i} — A manuscript`,
      headline: `Update ${i}`,
      body: `line ${i}`,
      href: `${APP}/panels/p${i}`,
      createdAt: new Date(t0 + i),
    }));
    await getDb().insert(notices).values(rows);

    expect(await flushNotices(Date.now())).toBe(1);

    const [mail] = await getDb().select().from(mailOutbox).where(eq(mailOutbox.to, "reviewer@partner.example.org"));
    expect(mail!.subject.startsWith("60 updates on A manuscript: Update 0; Update 1;")).toBe(true);
    const opened = [...mail!.text.matchAll(/^Open: (\S+)$/gm)].map((m) => m[1]);
    expect(opened).toHaveLength(51);
    expect(opened[0]).toBe(`${APP}/panels/p0`);
    expect(opened[49]).toBe(`${APP}/panels/p49`);
    expect(opened[50]).toBe(`${APP}/manuscripts/${DEMO_MANUSCRIPT_ID}/activity`);
    expect(mail!.text).toContain("• …and 10 more\n");
    expect(mail!.text).not.toContain("Update 50");

    const token = decodeURIComponent(/unsubscribe\?token=([^\s>]+)/.exec(mail!.text)![1]!);
    expect((await describeUnsubscribe(token)).kinds.map((k) => k.kind).sort()).toEqual(["approved", "reply"]);

    expect(await getDb().select().from(notices).where(isNull(notices.mailId))).toEqual([]);
    const taken = await getDb().select({ mailId: notices.mailId }).from(notices).where(eq(notices.userId, "demo-reviewer"));
    expect(new Set(taken.map((n) => n.mailId))).toEqual(new Set([mail!.id]));
  });
});
