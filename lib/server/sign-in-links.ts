import "server-only";
import { and, eq, gt, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { signInLinks } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";
import { newId, newSecret, sha256Hex } from "./crypto";
import { enqueueMail } from "./mail/enqueue";
import { deliverOutbox } from "./mail/outbox";
import { signInLinkMail } from "./mail/templates";
import { consumeRate, type RateRule } from "./limits/rate-limit";
import { findUserByEmail, getUserById, normaliseEmail } from "./users";

const LINK_TTL_MS = 15 * 60 * 1000;

const HOUR_MS = 3600 * 1000;

/** Counted per address asked for and per client address, whether or not an account exists, so a 429 reveals nothing. */
function signInLinkRateRules(email: string, clientAddress: string): RateRule[] {
  return [
    {
      bucket: `sign-in-link:to:${normaliseEmail(email)}`,
      max: 3,
      windowMs: 15 * 60 * 1000,
      message: "Three sign-in links were sent to this address in the last 15 minutes; use the newest.",
    },
    { bucket: `sign-in-link:from:${clientAddress}`, max: 30, windowMs: HOUR_MS, message: "Too many sign-in links were asked for from this address." },
  ];
}

/** Always answers the same way, so the form does not reveal which addresses have accounts. */
export async function requestSignInLink(email: string, clientAddress: string): Promise<void> {
  await consumeRate(signInLinkRateRules(email, clientAddress));
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
  const used = await db
    .update(signInLinks)
    .set({ usedAt: new Date() })
    .where(and(eq(signInLinks.tokenHash, sha256Hex(token)), isNull(signInLinks.usedAt), gt(signInLinks.expiresAt, new Date())))
    .returning({ userId: signInLinks.userId });
  if (!used[0]) return null;
  return getUserById(used[0].userId);
}
