import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { labMembers, manuscriptMembers, type Role } from "@/db/schema";
import { forbidden, notFound } from "@/lib/errors";
import { onceInRequest } from "@/lib/request-memo";
import { isManuscriptAction, roleAllows, type Action, type ManuscriptAction } from "./policy";

export * from "./policy";

export interface SessionUser {
  id: string;
  email: string;
  name: string;
}

const roleLookup = preparedQuery((db) =>
  db
    .select({ role: manuscriptMembers.role })
    .from(manuscriptMembers)
    .where(and(eq(manuscriptMembers.userId, sql.placeholder("userId")), eq(manuscriptMembers.manuscriptId, sql.placeholder("manuscriptId"))))
    .prepare(),
);

export const ROLE_MEMO_PREFIX = "role:";

/** Asked once per request (the route's gate and the service behind it both ask); membership writes forget it. */
function roleOn(userId: string, manuscriptId: string): Promise<Role | null> {
  return onceInRequest(`${ROLE_MEMO_PREFIX}${userId}:${manuscriptId}`, async () => (await roleLookup().get({ userId, manuscriptId }))?.role ?? null);
}

const ACTION_WORDS: Record<ManuscriptAction, string> = {
  "manuscript.read": "view this manuscript",
  "manuscript.export": "export from this manuscript",
  "member.manage": "manage members (PI only)",
  "dataset.upload": "upload data (PI and authors)",
  "dataset.edit": "edit dataset details (PI and authors)",
  "analysis.run": "run analyses (PI and authors)",
  "figure.edit": "edit figures (PI and authors)",
  "bundle.import": "import bundles (PI and authors)",
  "comment.write": "comment (PI, authors and reviewers)",
  "review.decide": "record review decisions (PI, authors and reviewers)",
  "figure.signoff": "sign off figures (PI only)",
  "archive.manage": "archive or restore (PI and authors)",
  "archive.delete": "delete archived things for good (PI only)",
};

/**
 * The gate every route and action goes through. Non-members get 404 so that existence does not
 * leak; members whose role lacks the action get 403 with what it takes.
 */
export async function authorize(user: SessionUser, action: Action, manuscriptId?: string): Promise<Role | null> {
  if (!isManuscriptAction(action)) return null;
  if (!manuscriptId) throw notFound();
  const role = await roleOn(user.id, manuscriptId);
  if (!role) throw notFound();
  if (!roleAllows(role, action)) throw forbidden(`Your role does not allow you to ${ACTION_WORDS[action]}.`);
  return role;
}

/** Lab scope: creating a manuscript in a lab needs membership of that lab; others get 404. */
export async function authorizeLab(user: SessionUser, labId: string): Promise<void> {
  const [m] = await getDb()
    .select({ role: labMembers.role })
    .from(labMembers)
    .where(and(eq(labMembers.userId, user.id), eq(labMembers.labId, labId)));
  if (!m) throw notFound("No such lab.");
}
