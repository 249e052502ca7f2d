import { and, eq, gt, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { signInLinks } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";
import { newId, newSecret, sha256Hex } from "./crypto";
import { enqueueMail, deliverOutbox } from "./mail/outbox";
import { signInLinkMail } from "./mail/templates";
import { findUserByEmail, getUserById } from "./users";

const LINK_TTL_MS = 15 * 60 * 1000;

/** Always answers the same way, so the form does not reveal which addresses have accounts. */
export async function requestSignInLink(email: string): Promise<void> {
  const user = await findUserByEmail(email);
  if (!user) return;
  const { secret, hash } = newSecret("pls");
  await getDb().transaction(async (tx) => {
    await tx.insert(signInLinks).values({ id: newId(), userId: user.id, tokenHash: hash, expiresAt: new Date(Date.now() + LINK_TTL_MS) });
    await enqueueMail(tx, signInLinkMail(user.email, secret));
  });
  void deliverOutbox().catch(() => undefined);
}

/** Single use: the row is marked used by a conditional update, so two clicks cannot both sign in. */
export async function consumeSignInLink(token: string): Promise<SessionUser | null> {
  const db = getDb();
  const used = await db.update(signInLinks).set({ usedAt: new Date() })
    .where(and(eq(signInLinks.tokenHash, sha256Hex(token)), isNull(signInLinks.usedAt), gt(signInLinks.expiresAt, new Date())))
    .returning({ userId: signInLinks.userId });
  if (!used[0]) return null;
  return getUserById(used[0].userId);
}
