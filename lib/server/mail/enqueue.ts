import "server-only";
import type { Executor } from "@/db/client";
import { mailOutbox } from "@/db/schema";
import { newId } from "../crypto";
import type { MailView } from "./render-html";

export interface MailMessage {
  kind: string;
  to: string;
  subject: string;
  /** The plain-text part: always complete (every link written out). */
  text: string;
  /** What the HTML part is drawn from (react-email, when the outbox worker delivers). */
  view?: MailView;
  /** Extra headers, e.g. List-Unsubscribe (RFC 2369) and List-Unsubscribe-Post (RFC 8058). */
  headers?: Record<string, string>;
}

/** Written in the caller's transaction, so a mail exists exactly when the event that caused it does. */
export async function enqueueMail(tx: Executor, m: MailMessage): Promise<string> {
  const id = newId();
  await tx.insert(mailOutbox).values({
    id,
    kind: m.kind,
    to: m.to,
    subject: m.subject,
    text: m.text,
    view: m.view ?? null,
    headers: m.headers ?? null,
    nextAttemptAt: new Date(),
  });
  return id;
}
