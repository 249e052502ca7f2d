import "server-only";
import { desc, eq, asc, sql } from "drizzle-orm";
import { auditLog } from "@/db/schema";
import type { Executor } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { canonicalJson } from "@/lib/figures/canonical-spec";
import { sha256Hex } from "./crypto";

const GENESIS = "0".repeat(64);

export interface AuditEntryInput {
  actorId: string | null;
  manuscriptId?: string | null;
  action: string;
  target: string;
  data?: Record<string, unknown>;
}

function entryHash(prevHash: string, e: { at: number; actorId: string | null; manuscriptId: string | null; action: string; target: string; data: string }) {
  return sha256Hex(prevHash + canonicalJson(e));
}

/** Appends inside the caller's write transaction, so the chain is serialised with the change it records. */
const lastEntry = preparedQuery((db) => db.select({ hash: auditLog.hash }).from(auditLog).orderBy(desc(auditLog.seq)).limit(1).prepare());
const p = (name: string) => sql.placeholder(name);
const insertEntry = preparedQuery((db) =>
  db
    .insert(auditLog)
    .values({
      at: p("at"),
      actorId: p("actorId"),
      manuscriptId: p("manuscriptId"),
      action: p("action"),
      target: p("target"),
      data: p("data"),
      prevHash: p("prevHash"),
      hash: p("hash"),
    })
    .prepare(),
);

export async function appendAudit(tx: Executor, input: AuditEntryInput): Promise<void> {
  const last = await lastEntry(tx).get();
  const prevHash = last?.hash ?? GENESIS;
  const row = {
    at: Date.now(),
    actorId: input.actorId,
    manuscriptId: input.manuscriptId ?? null,
    action: input.action,
    target: input.target,
    data: canonicalJson(input.data ?? {}),
  };
  await insertEntry(tx).run({ ...row, at: new Date(row.at), prevHash, hash: entryHash(prevHash, row) });
}

/** Re-walks the chain; answers the first entry whose link or content does not match. */
export async function verifyAuditChain(db: Executor): Promise<{ ok: true; count: number } | { ok: false; seq: number; reason: string }> {
  const rows = await db.select().from(auditLog).orderBy(asc(auditLog.seq));
  let prev = GENESIS;
  for (const r of rows) {
    if (r.prevHash !== prev) return { ok: false, seq: r.seq, reason: "link to the previous entry is broken" };
    const expected = entryHash(prev, {
      at: r.at.getTime(),
      actorId: r.actorId,
      manuscriptId: r.manuscriptId,
      action: r.action,
      target: r.target,
      data: r.data,
    });
    if (expected !== r.hash) return { ok: false, seq: r.seq, reason: "entry content does not match its hash" };
    prev = r.hash;
  }
  return { ok: true, count: rows.length };
}

export async function listAuditForManuscript(db: Executor, manuscriptId: string, limit = 200) {
  return db.select().from(auditLog).where(eq(auditLog.manuscriptId, manuscriptId)).orderBy(desc(auditLog.seq)).limit(limit);
}
