import "server-only";
import { createHmac, timingSafeEqual } from "node:crypto";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { mailPreferences, users } from "@/db/schema";
import { env } from "@/lib/env";
import { AppError, badRequest, notFound } from "@/lib/errors";
import { appendAudit } from "../audit";
import { MAIL_LIST_KINDS, MAIL_LIST_LABELS, type MailListKind } from "./notice-kinds";

/** How long the link in a mail keeps working. */
const TOKEN_LIFETIME_MS = 60 * 24 * 60 * 60 * 1000;

interface Claims {
  /** The person whose mail is turned off. */
  u: string;
  /** The notice kinds (or "digest") turned off. */
  k: MailListKind[];
  /** Expiry, milliseconds since the epoch. */
  e: number;
}

function secret(): string {
  const s = env().authSecret;
  if (!s) throw new Error("AUTH_SECRET is not set: unsubscribe links cannot be signed.");
  return s;
}

const sign = (payload: string) => createHmac("sha256", secret()).update(`prooflight-unsubscribe\n${payload}`).digest("base64url");

/** A signed, expiring token naming one person and the notice kinds (or the digest) a click turns off; no database row. */
export function unsubscribeToken(userId: string, kinds: MailListKind[], now = Date.now()): string {
  const payload = Buffer.from(JSON.stringify({ u: userId, k: [...new Set(kinds)].sort(), e: now + TOKEN_LIFETIME_MS } satisfies Claims)).toString("base64url");
  return `${payload}.${sign(payload)}`;
}

const INVALID =
  "This unsubscribe link is not valid: it was changed or cut short. Use the link from the mail as it is, or choose your mail on the settings page.";

function verify(token: string, now: number): Claims {
  const [payload, mac, ...rest] = token.split(".");
  if (!payload || !mac || rest.length) throw badRequest(INVALID);
  const want = Buffer.from(sign(payload));
  const got = Buffer.from(mac);
  if (want.length !== got.length || !timingSafeEqual(want, got)) throw badRequest(INVALID);
  let claims: Claims;
  try {
    claims = JSON.parse(Buffer.from(payload, "base64url").toString("utf8")) as Claims;
  } catch {
    throw badRequest(INVALID);
  }
  if (typeof claims.u !== "string" || !Array.isArray(claims.k) || typeof claims.e !== "number" || !claims.k.every((k) => MAIL_LIST_KINDS.includes(k)))
    throw badRequest(INVALID);
  if (claims.e < now) throw new AppError(410, "gone", "This unsubscribe link has expired. Sign in and choose which mails you get on the mail settings page.");
  return claims;
}

export interface UnsubscribeView {
  email: string;
  kinds: Array<{ kind: MailListKind; label: string; alreadyOff: boolean }>;
}

/** What a token would turn off, for the landing page; 400 for a forged, altered or expired token. */
export async function describeUnsubscribe(token: string, now = Date.now()): Promise<UnsubscribeView> {
  const claims = verify(token, now);
  const [u] = await getDb().select({ email: users.email }).from(users).where(eq(users.id, claims.u));
  if (!u) throw notFound("The account this link was sent to no longer exists.");
  const [p] = await getDb().select().from(mailPreferences).where(eq(mailPreferences.userId, claims.u));
  return {
    email: u.email,
    kinds: claims.k.map((kind) => ({
      kind,
      label: MAIL_LIST_LABELS[kind],
      alreadyOff: kind === "digest" ? p?.digest === "off" : (p?.mutedKinds.includes(kind) ?? false),
    })),
  };
}

/** Turns the token's kinds off for its person (a second click changes nothing) and says what is off. */
export async function applyUnsubscribe(token: string, now = Date.now()): Promise<UnsubscribeView> {
  const claims = verify(token, now);
  await getDb().transaction(async (tx) => {
    const [u] = await tx.select({ id: users.id }).from(users).where(eq(users.id, claims.u));
    if (!u) throw notFound("The account this link was sent to no longer exists.");
    const [p] = await tx.select().from(mailPreferences).where(eq(mailPreferences.userId, claims.u));
    const muted = [...new Set([...(p?.mutedKinds ?? []), ...claims.k.filter((k) => k !== "digest")])].sort();
    const digest = claims.k.includes("digest") ? ("off" as const) : (p?.digest ?? "daily");
    await tx
      .insert(mailPreferences)
      .values({ userId: claims.u, mutedKinds: muted, unfollowed: p?.unfollowed ?? [], digest, updatedAt: new Date(now) })
      .onConflictDoUpdate({ target: mailPreferences.userId, set: { mutedKinds: muted, digest, updatedAt: new Date(now) } });
    await appendAudit(tx, { actorId: claims.u, manuscriptId: null, action: "mail.unsubscribe", target: `user:${claims.u}`, data: { kinds: claims.k } });
  });
  return describeUnsubscribe(token, now);
}
