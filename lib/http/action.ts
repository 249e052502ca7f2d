import type { z } from "zod";
import { authorize, type Action, type SessionUser } from "@/lib/authz";
import { headers } from "next/headers";
import { env } from "@/lib/env";
import { AppError, forbidden } from "@/lib/errors";
import { ZodError } from "zod";
import { describeZodError } from "./errors";
import { currentUser } from "./session";

export type ActionState = { ok: boolean; message: string; fieldErrors?: Record<string, string>; data?: unknown } | null;
type Gate = { gate?: { permission: Action | "public" } };
type FormAction = ((prev: ActionState, form: FormData) => Promise<ActionState>) & Gate;

function formToObject(form: FormData): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of form.entries()) if (!k.startsWith("$ACTION")) out[k] = typeof v === "string" ? v : v;
  return out;
}

function failure(err: unknown): ActionState {
  if (err instanceof ZodError) {
    const { message, details } = describeZodError(err);
    return { ok: false, message, fieldErrors: Object.fromEntries(details.map((d) => [d.path, d.message])) };
  }
  if (err instanceof AppError) return { ok: false, message: err.message };
  // redirect() and notFound() work by throwing; let Next handle them.
  throw err;
}

/**
 * Next checks a server action's Origin against the host only when the header is present; a
 * request without one would pass. Forms here are always posted by a browser, which sends it.
 */
function requireSameOrigin(h: Headers): void {
  const origin = h.get("origin");
  if (!origin) throw forbidden("This form must be sent from Prooflight's own pages; the request had no Origin header.");
  let host: string;
  try {
    host = new URL(origin).host;
  } catch {
    throw forbidden("Cross-site request refused: the Origin header is not a URL.");
  }
  if (host !== h.get("host") && host !== new URL(env().appUrl).host) throw forbidden("Cross-site request refused.");
}

/** The same gate as route handlers, for server actions: states the permission, validates the form, authorizes. */
export function withAction<I>(
  permission: Action,
  options: { input: z.ZodType<I>; scope?: (input: I) => string | Promise<string> },
  handler: (a: { user: SessionUser; input: I }) => Promise<ActionState | void>,
): FormAction {
  const fn: FormAction = async (_prev, form) => {
    try {
      requireSameOrigin(await headers());
      const user = await currentUser();
      if (!user) return { ok: false, message: "Your session has ended. Sign in again." };
      const input = options.input.parse(formToObject(form));
      await authorize(user, permission, options.scope ? await options.scope(input) : undefined);
      return (await handler({ user, input })) ?? { ok: true, message: "Saved." };
    } catch (err) {
      return failure(err);
    }
  };
  fn.gate = { permission };
  return fn;
}

/** Public actions (sign-in, accepting an invitation): on the allow-list of the gate test. */
export function publicAction<I>(input: z.ZodType<I>, handler: (input: I) => Promise<ActionState | void>): FormAction {
  const fn: FormAction = async (_prev, form) => {
    try {
      requireSameOrigin(await headers());
      return (await handler(input.parse(formToObject(form)))) ?? { ok: true, message: "Done." };
    } catch (err) {
      return failure(err);
    }
  };
  fn.gate = { permission: "public" };
  return fn;
}
