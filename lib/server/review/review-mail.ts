import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";
import { env } from "@/lib/env";
import type { MailMessage } from "../mail/outbox";
import { layout } from "../mail/templates";

async function emailOf(userId: string): Promise<string> {
  const [u] = await getDb().select({ email: users.email }).from(users).where(eq(users.id, userId));
  return u.email;
}

const panelLink = (panelId: string) => `${env().appUrl}/panels/${panelId}`;

export const reviewMail = {
  async needsRevision(toUserId: string, actor: SessionUser, panelId: string, note: string): Promise<MailMessage> {
    const href = panelLink(panelId);
    const lines = [`${actor.name} marked your panel as needing revision.`, ...(note ? [`Note: ${note}`] : [])];
    return {
      kind: "needs_revision",
      to: await emailOf(toUserId),
      subject: "A panel needs revision",
      text: `${lines.join("\n\n")}\n\nOpen: ${href}\n`,
      html: layout("A panel needs revision", lines, { href, label: "Open the panel" }),
    };
  },
  async mention(toUserId: string, actor: SessionUser, panelId: string, excerpt: string): Promise<MailMessage> {
    const href = panelLink(panelId);
    const lines = [`${actor.name} mentioned you in a comment:`, excerpt];
    return {
      kind: "mention",
      to: await emailOf(toUserId),
      subject: `${actor.name} mentioned you`,
      text: `${lines.join("\n\n")}\n\nOpen: ${href}\n`,
      html: layout("You were mentioned", lines, { href, label: "Open the thread" }),
    };
  },
};
