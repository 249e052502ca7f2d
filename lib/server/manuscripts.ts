import "server-only";
import { asc, eq, sql } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { preparedQuery } from "@/db/prepared";
import { labMembers, labs, manuscriptMembers, manuscripts, users, type Role } from "@/db/schema";
import { authorize, authorizeLab, type SessionUser } from "@/lib/authz";
import { appendAudit } from "./audit";
import { newId } from "./crypto";
import { badRequest, notFound } from "@/lib/errors";

export const createManuscriptInput = z.object({
  title: z.string().trim().min(1, "Give the manuscript a title.").max(300),
  labId: z.string().min(1).max(128).optional(),
});

export async function listLabsForUser(user: SessionUser) {
  return getDb()
    .select({ id: labs.id, name: labs.name, role: labMembers.role })
    .from(labMembers)
    .innerJoin(labs, eq(labs.id, labMembers.labId))
    .where(eq(labMembers.userId, user.id))
    .orderBy(asc(labs.name));
}

export async function listManuscriptsForUser(user: SessionUser) {
  return getDb()
    .select({
      id: manuscripts.id,
      title: manuscripts.title,
      labId: manuscripts.labId,
      labName: labs.name,
      role: manuscriptMembers.role,
      createdAt: manuscripts.createdAt,
    })
    .from(manuscriptMembers)
    .innerJoin(manuscripts, eq(manuscripts.id, manuscriptMembers.manuscriptId))
    .innerJoin(labs, eq(labs.id, manuscripts.labId))
    .where(eq(manuscriptMembers.userId, user.id))
    .orderBy(asc(manuscripts.title));
}

export async function createManuscript(user: SessionUser, input: z.infer<typeof createManuscriptInput>) {
  const { title, labId: requested } = createManuscriptInput.parse(input);
  let labId = requested;
  if (!labId) {
    const mine = await listLabsForUser(user);
    if (mine.length !== 1) throw badRequest("labId: say which of your labs the manuscript belongs to.");
    labId = mine[0].id;
  }
  await authorizeLab(user, labId);
  const id = newId();
  await getDb().transaction(async (tx) => {
    await tx.insert(manuscripts).values({ id, labId: labId, title, createdBy: user.id });
    await tx.insert(manuscriptMembers).values({ manuscriptId: id, userId: user.id, role: "pi" });
    await appendAudit(tx, { actorId: user.id, manuscriptId: id, action: "manuscript.create", target: `manuscript:${id}`, data: { title } });
  });
  return getManuscript(user, id);
}

export async function listMembers(manuscriptId: string) {
  return getDb()
    .select({ userId: users.id, name: users.name, email: users.email, role: manuscriptMembers.role, since: manuscriptMembers.createdAt })
    .from(manuscriptMembers)
    .innerJoin(users, eq(users.id, manuscriptMembers.userId))
    .where(eq(manuscriptMembers.manuscriptId, manuscriptId))
    .orderBy(asc(users.name));
}

const manuscriptRow = preparedQuery((db) =>
  db
    .select({
      id: manuscripts.id,
      title: manuscripts.title,
      labId: manuscripts.labId,
      labName: labs.name,
      createdAt: manuscripts.createdAt,
      reviewStamp: manuscripts.reviewStamp,
    })
    .from(manuscripts)
    .innerJoin(labs, eq(labs.id, manuscripts.labId))
    .where(eq(manuscripts.id, sql.placeholder("id")))
    .prepare(),
);

/** The manuscript with its figures, panels and derived review states (figures arrive with the figure work). */
/** `knownRole` is the role the route gate already established for this request, so it is not looked up twice. */
async function manuscriptOverview(user: SessionUser, manuscriptId: string, knownRole?: Role | null) {
  const role = knownRole ?? (await authorize(user, "manuscript.read", manuscriptId));
  const m = await manuscriptRow().get({ id: manuscriptId });
  if (!m) throw notFound();
  const { reviewStamp, ...manuscript } = m;
  const { overviewSnapshot } = await import("./review/overview-snapshot");
  return { manuscript: { ...manuscript, role }, snapshot: await overviewSnapshot(manuscriptId, reviewStamp) };
}

async function present({ manuscript, snapshot }: Awaited<ReturnType<typeof manuscriptOverview>>) {
  const { presentFigures } = await import("./figures/figures");
  return {
    ...manuscript,
    members: snapshot.members,
    figures: presentFigures(snapshot.reviews, manuscript.role, snapshot.warningCounts),
    datasetCount: snapshot.datasetCount,
  };
}

export async function getManuscript(user: SessionUser, manuscriptId: string, knownRole?: Role | null) {
  return present(await manuscriptOverview(user, manuscriptId, knownRole));
}

export async function getManuscriptTitle(manuscriptId: string): Promise<string> {
  const [m] = await getDb().select({ title: manuscripts.title }).from(manuscripts).where(eq(manuscripts.id, manuscriptId));
  if (!m) throw notFound();
  return m.title;
}

export async function membershipsForUser(userId: string) {
  return getDb()
    .select({ manuscriptId: manuscriptMembers.manuscriptId, role: manuscriptMembers.role })
    .from(manuscriptMembers)
    .where(eq(manuscriptMembers.userId, userId));
}

export async function labMembershipsForUser(userId: string) {
  return getDb().select({ labId: labMembers.labId, role: labMembers.role }).from(labMembers).where(eq(labMembers.userId, userId));
}
