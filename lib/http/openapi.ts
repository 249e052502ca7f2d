import { z } from "zod";
import { API_OPERATIONS, type ApiOperation } from "./api-catalogue";

const errorSchema = {
  type: "object",
  required: ["error"],
  properties: { error: { type: "object", required: ["code", "message"], properties: { code: { type: "string" }, message: { type: "string" }, details: {} } } },
};

const errorRef = (description: string, retryAfter = false) => ({
  description,
  ...(retryAfter ? { headers: { "Retry-After": { description: "Seconds until a retry may succeed", schema: { type: "integer" } } } } : {}),
  content: { "application/json": { schema: { $ref: "#/components/schemas/Error" } } },
});

/** The limits every writer meets: body size, nesting, rate and, for uploads, stalls and concurrency. */
function limitResponses(op: ApiOperation): Record<string, unknown> {
  if (op.method === "GET") return {};
  const out: Record<string, unknown> = {
    400: errorRef("Bad input: the message names the field, line or path; JSON nested past 64 levels or with a __proto__ key is refused"),
    413: errorRef(op.multipart ? "The file is larger than UPLOAD_MAX_BYTES" : "The JSON body is larger than its cap (1 MB; 2 MB for panel revisions)"),
  };
  if (op.multipart) {
    out[408] = errorRef("The upload stalled: no byte arrived for UPLOAD_IDLE_TIMEOUT_MS (code upload_stalled)");
    out[429] = errorRef("Too many uploads at once or per hour", true);
  } else if (/sign-in-link|threads|comments|members/.test(op.path)) {
    out[429] = errorRef("Rate limited", true);
  }
  return out;
}

export function buildOpenApi(): Record<string, unknown> {
  const paths: Record<string, Record<string, unknown>> = {};
  for (const op of API_OPERATIONS) {
    const pathParams = [...op.path.matchAll(/\{(\w+)\}/g)].map((m) => ({ name: m[1], in: "path", required: true, schema: { type: "string" } }));
    const querySchema = op.query ? (z.toJSONSchema(op.query, { io: "input" }) as { properties?: Record<string, unknown>; required?: string[] }) : null;
    const queryParams = Object.entries(querySchema?.properties ?? {}).map(([name, schema]) => ({
      name,
      in: "query",
      required: querySchema?.required?.includes(name) ?? false,
      schema,
    }));
    const headerParams = Object.entries(op.headers ?? {}).map(([name, description]) => ({
      name,
      in: "header",
      required: false,
      description,
      schema: { type: "string" },
    }));
    const params = [...pathParams, ...queryParams, ...headerParams];
    const requestBody = op.body
      ? { required: true, content: { "application/json": { schema: z.toJSONSchema(op.body, { io: "input" }) } } }
      : op.multipart
        ? {
            required: true,
            content: {
              "multipart/form-data": {
                schema: {
                  type: "object",
                  properties: Object.fromEntries(Object.entries(op.multipart).map(([k, d]) => [k, { type: "string", description: d }])),
                },
              },
            },
          }
        : undefined;
    (paths[op.path] ??= {})[op.method.toLowerCase()] = {
      summary: op.summary,
      "x-permission": op.permission,
      ...(params.length ? { parameters: params } : {}),
      ...(requestBody ? { requestBody } : {}),
      ...(op.permission === "public" ? { security: [] } : {}),
      responses: {
        [String(op.success)]: { description: "Success" },
        ...limitResponses(op),
        default: { description: "Error", content: { "application/json": { schema: { $ref: "#/components/schemas/Error" } } } },
      },
    };
  }
  return {
    openapi: "3.1.0",
    info: {
      title: "Prooflight API",
      version: "0.1.0",
      description: "Send `Authorization: Bearer <token>` (create one with `npm run token -- <email>` or on the API tokens page). Non-members get 404.",
    },
    components: {
      securitySchemes: { bearer: { type: "http", scheme: "bearer" }, session: { type: "apiKey", in: "cookie", name: "authjs.session-token" } },
      schemas: { Error: errorSchema },
    },
    security: [{ bearer: [] }, { session: [] }],
    paths,
  };
}
