import { and, count, eq, gt, lt } from "drizzle-orm";
import { getDb } from "@/db/client";
import { signInFailures } from "@/db/schema";
import { normaliseEmail } from "./users";

export const SIGN_IN_WINDOW_MS = 15 * 60 * 1000;
export const MAX_FAILURES_PER_ACCOUNT = 5;
export const MAX_FAILURES_PER_IP = 20;

/** Null when another attempt is allowed, else the sentence to show. */
export async function signInBlockedReason(email: string, ip: string): Promise<string | null> {
  const since = new Date(Date.now() - SIGN_IN_WINDOW_MS);
  const db = getDb();
  const [byAccount] = await db.select({ n: count() }).from(signInFailures)
    .where(and(eq(signInFailures.email, normaliseEmail(email)), gt(signInFailures.at, since)));
  if ((byAccount?.n ?? 0) >= MAX_FAILURES_PER_ACCOUNT)
    return "Too many failed sign-ins for this account. Wait 15 minutes or use an e-mail sign-in link.";
  const [byIp] = await db.select({ n: count() }).from(signInFailures)
    .where(and(eq(signInFailures.ip, ip), gt(signInFailures.at, since)));
  if ((byIp?.n ?? 0) >= MAX_FAILURES_PER_IP) return "Too many failed sign-ins from this address. Wait 15 minutes.";
  return null;
}

export async function recordSignInFailure(email: string, ip: string): Promise<void> {
  const db = getDb();
  await db.insert(signInFailures).values({ email: normaliseEmail(email), ip, at: new Date() });
  await db.delete(signInFailures).where(lt(signInFailures.at, new Date(Date.now() - 2 * SIGN_IN_WINDOW_MS)));
}

export function clientIp(headers: Headers): string {
  return headers.get("x-forwarded-for")?.split(",")[0]?.trim() || headers.get("x-real-ip") || "local";
}
