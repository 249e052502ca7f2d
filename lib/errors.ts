/**
 * Errors a service (lib/server) or the policy gate (lib/authz) may raise; route handlers and actions map
 * them to HTTP with the contract's JSON shape. Plain TypeScript with no imports, so every layer can share it.
 */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
    /** For 429 and 503: seconds after which a retry may succeed (sent as Retry-After). */
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
    this.name = "AppError";
  }
}

export const badRequest = (message: string, details?: unknown) => new AppError(400, "bad_request", message, details);
export const unauthorized = (message = "Sign in or send an API token (Authorization: Bearer …).") => new AppError(401, "unauthorized", message);
export const forbidden = (message: string) => new AppError(403, "forbidden", message);
export const notFound = (what = "Not found.") => new AppError(404, "not_found", what);
export const conflict = (message: string, details?: unknown) => new AppError(409, "conflict", message, details);
export const tooLarge = (message: string) => new AppError(413, "too_large", message);
export const unsupported = (message: string, details?: unknown) => new AppError(415, "unsupported_media_type", message, details);
export const unprocessable = (message: string, details?: unknown) => new AppError(422, "unprocessable", message, details);
export const tooManyRequests = (message: string, retryAfterSeconds = 60) =>
  new AppError(429, "too_many_requests", message, undefined, Math.max(1, Math.ceil(retryAfterSeconds)));
