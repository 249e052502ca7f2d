import "server-only";
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";

const BCRYPT_COST = 10;

export const normaliseEmail = (email: string) => email.trim().toLowerCase();

/** An e-mail address as every form, action and route takes it: trimmed, at most 254 characters (RFC 5321), well formed. */
export const emailInput = z.string().trim().max(254, "An e-mail address has at most 254 characters.").email("Give a valid e-mail address.");

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

export async function findUserByEmail(email: string) {
  const [u] = await getDb()
    .select()
    .from(users)
    .where(eq(users.email, normaliseEmail(email)));
  return u ?? null;
}

export async function getUserById(id: string): Promise<SessionUser | null> {
  const [u] = await getDb().select({ id: users.id, email: users.email, name: users.name }).from(users).where(eq(users.id, id));
  return u ?? null;
}

// Compared against for unknown e-mails, so they cost the same time as a wrong password.
let dummyHash: string | undefined;

export async function verifyPassword(email: string, password: string): Promise<SessionUser | null> {
  const u = await findUserByEmail(email);
  const ok = await bcrypt.compare(password, u?.passwordHash ?? (dummyHash ??= bcrypt.hashSync("no-such-user", BCRYPT_COST)));
  if (!u || !u.passwordHash || !ok) return null;
  return { id: u.id, email: u.email, name: u.name };
}
