// OpenAPI 3.1 description, generated from the same zod schemas that validate the requests.
import { buildOpenApi } from "@/lib/http/openapi";
import { publicRoute } from "@/lib/http/route";

export const GET = publicRoute(() => Response.json(buildOpenApi()));
