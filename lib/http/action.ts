import type { z } from "zod";
import { authorize, type Action, type SessionUser } from "@/lib/authz";
import { AppError } from "@/lib/server/errors";
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

/** The same gate as route handlers, for server actions: states the permission, validates the form, authorizes. */
export function withAction<I>(
  permission: Action,
  options: { input: z.ZodType<I>; scope?: (input: I) => string | Promise<string> },
  handler: (a: { user: SessionUser; input: I }) => Promise<ActionState | void>,
): FormAction {
  const fn: FormAction = async (_prev, form) => {
    try {
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
      return (await handler(input.parse(formToObject(form)))) ?? { ok: true, message: "Done." };
    } catch (err) {
      return failure(err);
    }
  };
  fn.gate = { permission: "public" };
  return fn;
}
