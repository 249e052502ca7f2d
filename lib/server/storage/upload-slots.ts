import "server-only";
import { env } from "@/lib/env";
import { tooManyRequests } from "@/lib/errors";

/**
 * How many uploads this process is reading and parsing right now, per user and in total. An upload
 * holds its slot from the first byte read until it is stored or refused, since parsing keeps the
 * whole file in memory. In-process on purpose: the limit protects this process's memory and disk.
 */
const byUser = new Map<string, number>();
let total = 0;

/** Seconds a refused client is told to wait: uploads usually finish within that. */
const UPLOAD_SLOT_RETRY_SECONDS = 30;

/** Takes a slot or throws 429 with Retry-After. Call the returned function (once, in `finally`) to give it back. */
export function acquireUploadSlot(userId: string): () => void {
  const { uploadsPerUser, uploadsInTotal } = env();
  const mine = byUser.get(userId) ?? 0;
  if (mine >= uploadsPerUser) {
    throw tooManyRequests(
      `You already have ${mine} upload${mine === 1 ? "" : "s"} in progress. Wait for one to finish, then try again.`,
      UPLOAD_SLOT_RETRY_SECONDS,
    );
  }
  if (total >= uploadsInTotal) throw tooManyRequests(`The server is handling ${total} uploads already. Try again in a moment.`, UPLOAD_SLOT_RETRY_SECONDS);
  byUser.set(userId, mine + 1);
  total += 1;
  let released = false;
  return () => {
    if (released) return;
    released = true;
    total -= 1;
    const left = (byUser.get(userId) ?? 1) - 1;
    if (left > 0) byUser.set(userId, left);
    else byUser.delete(userId);
  };
}

/** The slots in use, for tests and diagnostics. */
export function uploadSlotUsage(): { total: number; byUser: Record<string, number> } {
  return { total, byUser: Object.fromEntries(byUser) };
}
