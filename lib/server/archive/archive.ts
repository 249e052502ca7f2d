import "server-only";
import { eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { analyses, datasets, figures, panels } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { conflict, notFound } from "@/lib/errors";
import { appendAudit } from "../audit";
import { describeTarget, referencesTo, type ArchiveKind } from "./references";

export const archiveInput = z.object({ archived: z.boolean({ message: "archived must be true (archive) or false (restore)" }) });

/** `?archived=1` on a list: only the archived rows (the "Show archived" view). */
export const archivedQuery = z.object({ archived: z.enum(["0", "1"], { message: 'archived must be "0" or "1"' }).optional() });

const TABLES = { dataset: datasets, analysis: analyses, panel: panels, figure: figures } as const;

async function target(kind: ArchiveKind, id: string) {
  const t = await describeTarget(getDb(), kind, id);
  if (!t) throw notFound();
  return t;
}

/** Which manuscript a dataset, analysis, panel or figure belongs to (404 for unknown ids), for the route's scope. */
export async function manuscriptOfArchivable(kind: ArchiveKind, id: string): Promise<string> {
  return (await target(kind, id)).manuscriptId;
}

/**
 * Archive (hide from lists and pickers) or restore. Nothing is removed: every trace, bundle, decision
 * and revision that names the thing still resolves it. An archived panel leaves its figure's layout.
 */
export async function setArchived(user: SessionUser, kind: ArchiveKind, id: string, raw: z.infer<typeof archiveInput>) {
  const t = await target(kind, id);
  await authorize(user, "archive.manage", t.manuscriptId);
  const { archived } = archiveInput.parse(raw);
  const at = archived ? new Date() : null;
  await getDb().transaction(async (tx) => {
    const table = TABLES[kind];
    await tx.update(table).set({ archivedAt: at }).where(eq(table.id, id));
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId: t.manuscriptId,
      action: archived ? "archive.archive" : "archive.restore",
      target: `${kind}:${id}`,
      data: { kind, what: t.what },
    });
  });
  return { kind, id, archivedAt: at?.toISOString() ?? null };
}

/** Permanent deletion by the PI, of an archived thing nothing references; otherwise 409 naming what does. */
export async function deleteForGood(user: SessionUser, kind: ArchiveKind, id: string) {
  const t = await target(kind, id);
  await authorize(user, "archive.delete", t.manuscriptId);
  await getDb().transaction(async (tx) => {
    const now = await describeTarget(tx, kind, id);
    if (!now) throw notFound();
    if (!now.archivedAt) throw conflict(`Archive ${now.what} before deleting it for good.`);
    const refs = await referencesTo(tx, kind, id, t.manuscriptId);
    if (refs.length)
      throw conflict(`${now.what.charAt(0).toUpperCase()}${now.what.slice(1)} cannot be deleted: ${refs.join("; ")}. It stays archived.`, { references: refs });
    const table = TABLES[kind];
    await tx.delete(table).where(eq(table.id, id));
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId: t.manuscriptId,
      action: "archive.delete",
      target: `${kind}:${id}`,
      data: { kind, what: now.what },
    });
  });
  return { kind, id, deleted: true };
}
