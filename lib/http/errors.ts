import { ZodError } from "zod";
import { AppError } from "@/lib/errors";
import { describeForLog } from "./redact";

interface ErrorBody {
  error: { code: string; message: string; details?: unknown };
}

export function errorResponse(status: number, code: string, message: string, details?: unknown, retryAfterSeconds?: number): Response {
  const body: ErrorBody = { error: { code, message, ...(details === undefined ? {} : { details }) } };
  const headers = retryAfterSeconds ? { "retry-after": String(retryAfterSeconds) } : undefined;
  return Response.json(body, { status, headers });
}

/** Names each bad field by its path, e.g. `role: Invalid option: expected one of "pi"|"author"…`. */
export function describeZodError(err: ZodError): { message: string; details: Array<{ path: string; message: string }> } {
  const details = err.issues.map((i) => ({ path: i.path.join(".") || "(body)", message: i.message }));
  return { message: details.map((d) => `${d.path}: ${d.message}`).join("; "), details };
}

/** Every error becomes the contract's JSON shape; only a genuine bug is a 500. */
export function toErrorResponse(err: unknown): Response {
  if (err instanceof AppError) return errorResponse(err.status, err.code, err.message, err.details, err.retryAfterSeconds);
  if (err instanceof ZodError) {
    const { message, details } = describeZodError(err);
    return errorResponse(400, "bad_request", message, details);
  }
  const status = (err as { httpStatus?: number })?.httpStatus;
  if (typeof status === "number" && status >= 400 && status < 500) {
    const e = err as Error & { code?: string; details?: unknown };
    return errorResponse(status, e.code ?? "bad_request", e.message, e.details);
  }
  console.error(`[prooflight] unexpected error: ${describeForLog(err)}`);
  return errorResponse(500, "internal", "Something went wrong on our side. It has been logged.");
}
