/** Our secrets (API tokens, sign-in links, invitations), bearer credentials and session cookies. */
const SECRET = /\bpl[tsi]_[A-Za-z0-9_-]{20,}|\b(Bearer\s+)\S+|(authjs\.[\w.-]*session-token=)[^;\s"]+/gi;

/** Text with every secret replaced, so an error log can never hand out a way in. */
export function redactSecrets(text: string): string {
  return text.replace(SECRET, (_m, bearer?: string, cookie?: string) => `${bearer ?? cookie ?? ""}[redacted]`);
}

/** What to log of an unexpected error: its message and stack with secrets removed. */
export function describeForLog(err: unknown): string {
  const raw = err instanceof Error ? `${err.stack ?? err.message}${err.cause ? `\ncaused by: ${describeForLog(err.cause)}` : ""}` : String(err);
  return redactSecrets(raw);
}
