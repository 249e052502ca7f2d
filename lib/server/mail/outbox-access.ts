import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { labMembers } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";
import { env } from "@/lib/env";
import { isLoopback, PEER_HEADER } from "../limits/client-address";
import type { SinkMessage } from "./sink-store";

/** What the mail outbox page may show to this request: every message, one person's, or nothing (404). */
export type OutboxView = { kind: "all" } | { kind: "own"; email: string } | null;

/**
 * The sink holds sign-in links and invitations, so reading it is signing in as anyone.
 * Demo and development instances show it to requests from this machine only (the TCP peer,
 * never a header a client sets); production shows it only with MAIL_SINK_PAGE=on, and then
 * only to signed-in lab members, each their own mail.
 */
export async function outboxViewFor(headers: Headers, user: SessionUser | null): Promise<OutboxView> {
  const audience = env().mailSinkPage;
  if (audience === "loopback") return isLoopback(headers.get(PEER_HEADER)) ? { kind: "all" } : null;
  if (audience === "members" && user) {
    const [m] = await getDb().select({ labId: labMembers.labId }).from(labMembers).where(eq(labMembers.userId, user.id)).limit(1);
    return m ? { kind: "own", email: user.email } : null;
  }
  return null;
}

export function visibleTo(view: Exclude<OutboxView, null>, message: SinkMessage): boolean {
  if (view.kind === "all") return true;
  const own = view.email.toLowerCase();
  return message.envelope.to.some((to) => to.toLowerCase() === own);
}
