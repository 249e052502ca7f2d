import "server-only";
import { and, eq, gt, isNull, lt } from "drizzle-orm";
import { getDb } from "@/db/client";
import { sessions } from "@/db/schema";
import { newId } from "./crypto";

export const SESSION_MAX_AGE_S = 14 * 24 * 3600;

/** A browser sign-in: the row the session cookie names, so sign-out can end it on the server. */
export async function createSession(userId: string, now = Date.now()): Promise<string> {
  const id = newId();
  const db = getDb();
  await db.insert(sessions).values({ id, userId, expiresAt: new Date(now + SESSION_MAX_AGE_S * 1000) });
  // Ended sessions stay a while for the record, then are pruned now and then rather than on every sign-in.
  if (Math.random() < 0.05) await db.delete(sessions).where(lt(sessions.expiresAt, new Date(now - SESSION_MAX_AGE_S * 1000)));
  return id;
}

export async function isSessionActive(id: unknown, now = Date.now()): Promise<boolean> {
  if (typeof id !== "string" || !id) return false;
  const [row] = await getDb()
    .select({ id: sessions.id })
    .from(sessions)
    .where(and(eq(sessions.id, id), isNull(sessions.revokedAt), gt(sessions.expiresAt, new Date(now))))
    .limit(1);
  return Boolean(row);
}

export async function revokeSession(id: unknown): Promise<void> {
  if (typeof id !== "string" || !id) return;
  await getDb()
    .update(sessions)
    .set({ revokedAt: new Date() })
    .where(and(eq(sessions.id, id), isNull(sessions.revokedAt)));
}
