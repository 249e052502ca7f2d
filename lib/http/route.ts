import type { z } from "zod";
import { authorize, type Action, type SessionUser } from "@/lib/authz";
import type { Role } from "@/db/schema";
import { env } from "@/lib/env";
import { forbidden, unauthorized } from "@/lib/errors";
import { toErrorResponse } from "./errors";
import { readJsonBody } from "./read-json-body";
import { resolveCaller } from "./request-user";
import { withRequestMemo } from "@/lib/request-memo";

type Params = Record<string, string>;
type RouteContext = { params: Promise<Params> };
export type RouteHandler = ((req: Request, ctx: RouteContext) => Promise<Response>) & { gate?: GateInfo };
interface GateInfo {
  permission: Action | "public";
}

export interface HandlerArgs<B, Q> {
  req: Request;
  user: SessionUser;
  role: Role | null;
  params: Params;
  body: B;
  query: Q;
  manuscriptId?: string;
}

interface Options<B, Q> {
  /** Which manuscript the request touches; resolved before the permission check (404 when unknown). */
  scope?: (a: { params: Params; body: B; query: Q; user: SessionUser }) => Promise<string> | string;
  body?: z.ZodType<B>;
  query?: z.ZodType<Q>;
  /** Multipart or streaming routes read the body themselves. */
  rawBody?: boolean;
  /** Cap on the JSON body in bytes; JSON_BODY_MAX_BYTES (1 MB) unless a route needs more. */
  maxBodyBytes?: number;
}

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** The host of an Origin header; null for `null` (sandboxed frames, some redirects) or anything that is not a URL. */
function originHost(origin: string): string | null {
  try {
    return new URL(origin).host || null;
  } catch {
    return null;
  }
}

/** Cookie-authenticated writes must come from our own pages; route handlers have no CSRF check of their own. */
export function checkOrigin(req: Request) {
  const origin = req.headers.get("origin");
  const site = req.headers.get("sec-fetch-site");
  if (origin) {
    const allowed = new Set([new URL(env().appUrl).host, req.headers.get("host")]);
    const host = originHost(origin);
    if (host === null || !allowed.has(host)) throw forbidden("Cross-site request refused.");
    return;
  }
  if (site && site !== "same-origin") throw forbidden("Cross-site request refused.");
  if (!site) throw forbidden("Requests signed in with a cookie must carry an Origin header; scripts should use an API token.");
}

/** The one wrapper for route handlers: states the permission, authenticates, validates, authorizes. */
export function withPermission<B = undefined, Q = undefined>(
  permission: Action,
  options: Options<B, Q>,
  /** Returns (or resolves to) a Response, or a value sent as JSON. */
  handler: (a: HandlerArgs<B, Q>) => unknown,
): RouteHandler {
  const fn: RouteHandler = (req, ctx) => withRequestMemo(() => gated(req, ctx));
  const gated: RouteHandler = async (req, ctx) => {
    try {
      const caller = await resolveCaller(req);
      if (!caller) throw unauthorized();
      if (caller.via === "session" && !SAFE_METHODS.has(req.method)) checkOrigin(req);
      const params = (await ctx?.params) ?? {};
      const url = new URL(req.url);
      const query = (options.query ? options.query.parse(Object.fromEntries(url.searchParams)) : undefined) as Q;
      const body = (options.body && !options.rawBody ? options.body.parse(await readJsonBody(req, { maxBytes: options.maxBodyBytes })) : undefined) as B;
      const manuscriptId = options.scope ? await options.scope({ params, body, query, user: caller.user }) : undefined;
      const role = await authorize(caller.user, permission, manuscriptId);
      const out = await handler({ req, user: caller.user, role, params, body, query, manuscriptId });
      return out instanceof Response ? out : Response.json(out);
    } catch (err) {
      return toErrorResponse(err);
    }
  };
  fn.gate = { permission };
  return fn;
}

/** For the short allow-list of public endpoints (health, OpenAPI, auth). */
export function publicRoute(handler: (req: Request, ctx: RouteContext) => Response | Promise<Response>): RouteHandler {
  const fn: RouteHandler = async (req, ctx) => {
    try {
      return await handler(req, ctx);
    } catch (err) {
      return toErrorResponse(err);
    }
  };
  fn.gate = { permission: "public" };
  return fn;
}

export const created = (body: unknown) => Response.json(body, { status: 201 });
