import "server-only";
import { and, desc, eq, isNull, sql } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { apiTokens, users } from "@/db/schema";
import type { SessionUser } from "@/lib/authz";
import { appendAudit } from "./audit";
import { newId, newSecret, sha256Hex } from "./crypto";
import { notFound } from "@/lib/errors";

const LAST_USED_PRECISION_MS = 60_000;

export const createTokenInput = z.object({ name: z.string().trim().min(1, "Give the token a name.").max(80) });

export async function createApiToken(user: SessionUser, input: z.infer<typeof createTokenInput>) {
  const { name } = createTokenInput.parse(input);
  const { secret, hash } = newSecret("plt");
  const id = newId();
  await getDb().transaction(async (tx) => {
    await tx.insert(apiTokens).values({ id, userId: user.id, name, tokenHash: hash, prefix: secret.slice(0, 10) });
    await appendAudit(tx, { actorId: user.id, action: "token.create", target: `token:${id}`, data: { name } });
  });
  return { id, name, token: secret };
}

export async function listApiTokens(user: SessionUser) {
  return getDb()
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      prefix: apiTokens.prefix,
      createdAt: apiTokens.createdAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
    })
    .from(apiTokens)
    .where(eq(apiTokens.userId, user.id))
    .orderBy(desc(apiTokens.createdAt));
}

export async function revokeApiToken(user: SessionUser, tokenId: string): Promise<void> {
  await getDb().transaction(async (tx) => {
    const done = await tx
      .update(apiTokens)
      .set({ revokedAt: new Date() })
      .where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, user.id), isNull(apiTokens.revokedAt)))
      .returning({ id: apiTokens.id });
    if (!done[0]) throw notFound("No such active token.");
    await appendAudit(tx, { actorId: user.id, action: "token.revoke", target: `token:${tokenId}` });
  });
}

const tokenLookup = preparedQuery((db) =>
  db
    .select({ tokenId: apiTokens.id, lastUsedAt: apiTokens.lastUsedAt, id: users.id, email: users.email, name: users.name })
    .from(apiTokens)
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .where(and(eq(apiTokens.tokenHash, sql.placeholder("hash")), isNull(apiTokens.revokedAt)))
    .prepare(),
);

export async function userForApiToken(token: string): Promise<SessionUser | null> {
  const db = getDb();
  const row = await tokenLookup().get({ hash: sha256Hex(token) });
  if (!row) return null;
  // A write on every read would serialise all API traffic behind the disk; a minute's precision is enough.
  if (!row.lastUsedAt || Date.now() - row.lastUsedAt.getTime() > LAST_USED_PRECISION_MS)
    await db.update(apiTokens).set({ lastUsedAt: new Date() }).where(eq(apiTokens.id, row.tokenId));
  return { id: row.id, email: row.email, name: row.name };
}
