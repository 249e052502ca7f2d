// List the caller's manuscripts / create one in a lab the caller belongs to (the creator becomes PI).
import { created, withPermission } from "@/lib/http/route";
import { createManuscript, createManuscriptInput, listManuscriptsForUser } from "@/lib/server/manuscripts";

export const GET = withPermission("manuscript.list", {}, async ({ user }) => ({ items: await listManuscriptsForUser(user) }));

export const POST = withPermission("manuscript.create", { body: createManuscriptInput }, async ({ user, body }) => created(await createManuscript(user, body)));
