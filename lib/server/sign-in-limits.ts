import "server-only";
import { and, count, desc, eq, gt, lt } from "drizzle-orm";
import { getDb } from "@/db/client";
import { signInFailures } from "@/db/schema";
import { clientAddress } from "./limits/client-address";
import { describeWait } from "./limits/rate-limit";
import { normaliseEmail } from "./users";

/** Failures older than this no longer count. */
const SIGN_IN_WINDOW_MS = 60 * 60 * 1000;
/** Wrong passwords an account may have before each further try must wait. */
const FREE_FAILURES_PER_ACCOUNT = 3;
/** The longest wait one account can be given: slows guessing, never locks the owner out for long. */
const MAX_ACCOUNT_DELAY_S = 300;
const IP_WINDOW_MS = 15 * 60 * 1000;
const MAX_FAILURES_PER_IP = 20;

export interface SignInBlock {
  message: string;
  retryAfterSeconds: number;
}

/** Seconds an account must wait after its latest failure, given its failures in the window. */
function accountDelaySeconds(failures: number): number {
  if (failures < FREE_FAILURES_PER_ACCOUNT) return 0;
  return Math.min(2 ** (failures - FREE_FAILURES_PER_ACCOUNT + 1), MAX_ACCOUNT_DELAY_S);
}

/**
 * Null when another password attempt is allowed now. Per account the wait grows with each failure
 * (2 s, 4 s, … up to 5 min) instead of a lockout, and the e-mail sign-in link stays open; per
 * client address (the TCP peer or a trusted proxy's X-Forwarded-For) failures are capped.
 */
export async function signInBlock(email: string, ip: string, now = Date.now()): Promise<SignInBlock | null> {
  const db = getDb();
  const account = normaliseEmail(email);
  const recent = await db
    .select({ at: signInFailures.at })
    .from(signInFailures)
    .where(and(eq(signInFailures.email, account), gt(signInFailures.at, new Date(now - SIGN_IN_WINDOW_MS))))
    .orderBy(desc(signInFailures.at));
  const delay = accountDelaySeconds(recent.length);
  if (delay && recent[0]) {
    const wait = Math.ceil((recent[0].at.getTime() + delay * 1000 - now) / 1000);
    if (wait > 0) {
      return {
        message: `This account had ${recent.length} failed sign-ins recently; try again in ${describeWait(wait)}, or use an e-mail sign-in link, which works now.`,
        retryAfterSeconds: wait,
      };
    }
  }
  const [byIp] = await db
    .select({ n: count() })
    .from(signInFailures)
    .where(and(eq(signInFailures.ip, ip), gt(signInFailures.at, new Date(now - IP_WINDOW_MS))));
  if ((byIp?.n ?? 0) >= MAX_FAILURES_PER_IP) {
    return { message: "Too many failed sign-ins from this address. Wait 15 minutes.", retryAfterSeconds: IP_WINDOW_MS / 1000 };
  }
  return null;
}

/** `signInBlock` for a request: the client address is read from its headers (see ./limits/client-address). */
export function signInBlockFor(email: string, headers: Headers, now = Date.now()): Promise<SignInBlock | null> {
  return signInBlock(email, clientAddress(headers), now);
}

/** Null when another attempt is allowed, else the sentence to show. */
export async function signInBlockedReason(email: string, ip: string, now = Date.now()): Promise<string | null> {
  return (await signInBlock(email, ip, now))?.message ?? null;
}

export async function recordSignInFailure(email: string, ip: string, now = Date.now()): Promise<void> {
  const db = getDb();
  await db.insert(signInFailures).values({ email: normaliseEmail(email), ip, at: new Date(now) });
  await db.delete(signInFailures).where(lt(signInFailures.at, new Date(now - 2 * SIGN_IN_WINDOW_MS)));
}
