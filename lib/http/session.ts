import { notFound, redirect } from "next/navigation";
import { auth } from "@/auth";
import { authorize, type SessionUser } from "@/lib/authz";
import { AppError } from "@/lib/errors";
import { getUserById } from "@/lib/server/users";

export async function currentUser(): Promise<SessionUser | null> {
  const session = await auth();
  const uid = session?.user?.id;
  return uid ? getUserById(uid) : null;
}

export async function requireUser(): Promise<SessionUser> {
  const user = await currentUser();
  if (!user) redirect("/sign-in");
  return user;
}

/** Pages load through services; a 404 from the gate becomes the not-found page, never a leak. */
export async function loadOrNotFound<T>(load: () => Promise<T>): Promise<T> {
  try {
    return await load();
  } catch (err) {
    if (err instanceof AppError && (err.status === 404 || err.status === 403)) notFound();
    throw err;
  }
}

/**
 * For the layout of a dynamic segment with a loading.tsx: notFound() unless the signed-in person may
 * read the manuscript `scope` names. A layout renders above its segment's loading state, so this
 * answer is still a 404 status; a notFound() thrown under a streamed loading state arrives as 200.
 */
export async function requireReadableOrNotFound(scope: () => Promise<string>): Promise<void> {
  const user = await requireUser();
  await loadOrNotFound(async () => authorize(user, "manuscript.read", await scope()));
}
