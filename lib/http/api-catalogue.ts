import { z } from "zod";
import type { Action } from "@/lib/authz/policy";
import { createTokenInput } from "@/lib/server/api-tokens";
import { createManuscriptInput } from "@/lib/server/manuscripts";
import { changeRoleInput, inviteInput } from "@/lib/server/members";
import { metadataInput, plotQuery, rowsQuery } from "@/lib/server/datasets/schemas";
import { houseStyleSchema } from "@/lib/figures/house-style";
import { analysisInput, batchInput, calculatorInput, globalInput, comparisonInput, statisticsQuery } from "@/lib/server/analyses/schemas";
import { scalingInput } from "@/lib/server/analyses/scaling";
import { exportQuery } from "@/lib/server/export/export-figure";
import { traceQuery } from "@/lib/server/figures/trace";
import { thumbnailQuery } from "@/lib/server/export/thumbnails";
import { decisionInput, editCommentInput, newThreadInput, replyInput, resolveInput, signoffInput } from "@/lib/server/review/schemas";
import { threadFollowInput } from "@/lib/server/review/thread-follows";
import { withdrawSignoffInput } from "@/lib/server/review/review-edges";
import { archiveInput, archivedQuery } from "@/lib/server/archive/archive";
import { addPanelInput, createFigureInput, reorderInput, revisionInput, updateFigureInput } from "@/lib/server/figures/schemas";

const unsubscribeQuery = z.object({ token: z.string().describe("the signed token from the mail's List-Unsubscribe address") });

export interface ApiOperation {
  method: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  path: string; // OpenAPI style: /api/manuscripts/{id}
  permission: Action | "public";
  summary: string;
  body?: z.ZodType;
  multipart?: Record<string, string>;
  query?: z.ZodType;
  /** Optional request headers the operation honours, with what each does. */
  headers?: Record<string, string>;
  success: number;
}

/** Every route of the API, described once; the OpenAPI document and the route × role test read it. */
export const API_OPERATIONS: ApiOperation[] = [
  { method: "GET", path: "/api/health", permission: "public", summary: "Readiness: 200 once migrations are applied", success: 200 },
  { method: "GET", path: "/api/openapi.json", permission: "public", summary: "This document", success: 200 },
  { method: "GET", path: "/api/ping", permission: "public", summary: "Fixed JSON, no work (benchmark anchor)", success: 200 },
  {
    method: "POST",
    path: "/api/sign-in-link",
    permission: "public",
    summary: "E-mail a single-use sign-in link",
    body: z.object({ email: z.string().email() }),
    success: 202,
  },
  {
    method: "GET",
    path: "/api/unsubscribe",
    permission: "public",
    summary: "A mail's unsubscribe address opened in a browser: 303 to the landing page that asks first",
    query: unsubscribeQuery,
    success: 303,
  },
  {
    method: "POST",
    path: "/api/unsubscribe",
    permission: "public",
    summary: "One-click unsubscribe (RFC 8058): turns off the notice kinds the signed, expiring token names; no sign-in",
    query: unsubscribeQuery,
    success: 200,
  },
  { method: "GET", path: "/api/me", permission: "self.read", summary: "The caller and their memberships", success: 200 },
  { method: "GET", path: "/api/tokens", permission: "self.tokens", summary: "The caller's API tokens", success: 200 },
  { method: "POST", path: "/api/tokens", permission: "self.tokens", summary: "Create an API token (shown once)", body: createTokenInput, success: 201 },
  { method: "DELETE", path: "/api/tokens/{id}", permission: "self.tokens", summary: "Revoke an API token", success: 200 },
  { method: "GET", path: "/api/manuscripts", permission: "manuscript.list", summary: "The caller's manuscripts", success: 200 },
  {
    method: "POST",
    path: "/api/manuscripts",
    permission: "manuscript.create",
    summary: "Create a manuscript (the creator becomes PI)",
    body: createManuscriptInput,
    success: 201,
  },
  {
    method: "GET",
    path: "/api/manuscripts/{id}",
    permission: "manuscript.read",
    summary: "A manuscript with members, figures and review states",
    success: 200,
  },
  { method: "GET", path: "/api/manuscripts/{id}/members", permission: "manuscript.read", summary: "Members and pending invitations", success: 200 },
  {
    method: "POST",
    path: "/api/manuscripts/{id}/members",
    permission: "member.manage",
    summary: "Invite by e-mail with a role (PI only)",
    body: inviteInput,
    success: 201,
  },
  {
    method: "PATCH",
    path: "/api/manuscripts/{id}/members/{userId}",
    permission: "member.manage",
    summary: "Change a member's role",
    body: changeRoleInput,
    success: 200,
  },
  { method: "DELETE", path: "/api/manuscripts/{id}/members/{userId}", permission: "member.manage", summary: "Remove a member", success: 200 },
  {
    method: "GET",
    path: "/api/manuscripts/{id}/datasets",
    permission: "manuscript.read",
    summary: "Datasets with their latest version (archived ones left out; ?archived=1 lists only those)",
    query: archivedQuery,
    success: 200,
  },
  {
    method: "POST",
    path: "/api/manuscripts/{id}/datasets",
    permission: "dataset.upload",
    success: 201,
    summary:
      "Upload a file: a new dataset, or a new version with datasetId (identical bytes to the current version answer 200 with it). Parse errors name file, line and column (400/415/422); a file whose parse needs more memory than INGEST_HEAP_MB answers 413 (code ingest_memory_budget), one that takes longer than INGEST_TIMEOUT_MS 422 (code ingest_time_budget)",
    multipart: {
      file: "the instrument file (CSV, TSV, text with # header, JSON, 2-D map); binary",
      name: "dataset name (default: the file name)",
      metadata: "JSON: { kind, sample, instrument, measuredAt, notes, tags }",
      datasetId: "make this upload a new version of that dataset",
      delimiter: "override: , ; tab whitespace",
      decimal: "override: . or ,",
      format: "override: csv tsv text json matrix",
    },
  },
  { method: "GET", path: "/api/datasets/{id}", permission: "manuscript.read", summary: "A dataset with its versions", success: 200 },
  {
    method: "PATCH",
    path: "/api/datasets/{id}",
    permission: "dataset.edit",
    summary: "Edit metadata (audited, no new version)",
    body: metadataInput,
    success: 200,
  },
  {
    method: "GET",
    path: "/api/versions/{id}",
    permission: "manuscript.read",
    summary: "Version: sha256, size, rows, columns with units, warnings, summary",
    success: 200,
  },
  { method: "GET", path: "/api/versions/{id}/raw", permission: "manuscript.export", summary: "The original bytes", success: 200 },
  { method: "GET", path: "/api/versions/{id}/rows", permission: "manuscript.read", summary: "Parsed rows, paged", query: rowsQuery, success: 200 },
  {
    method: "GET",
    path: "/api/versions/{id}/plot",
    permission: "manuscript.read",
    summary: "Two columns downsampled for display",
    query: plotQuery,
    success: 200,
  },
  {
    method: "GET",
    path: "/api/versions/{id}/analyses",
    permission: "manuscript.read",
    summary: "Analysis runs on a version (archived ones left out; ?archived=1 lists only those)",
    query: archivedQuery,
    success: 200,
  },
  { method: "GET", path: "/api/analysis-models", permission: "model.list", summary: "Fit models and calculators with parameters and units", success: 200 },
  {
    method: "POST",
    path: "/api/analyses",
    permission: "analysis.run",
    summary: "Run and store a fit; answers parameters ± standard errors, χ²ᵣ and the derived version",
    body: analysisInput,
    success: 201,
  },
  { method: "POST", path: "/api/analyses/preview", permission: "analysis.run", summary: "Run a fit without storing it", body: analysisInput, success: 200 },
  {
    method: "POST",
    path: "/api/analyses/bootstrap",
    permission: "analysis.run",
    summary:
      "Run a fit with residual-bootstrap percentile intervals (options.bootstrap: draws, seed) without storing it; progress streams back as NDJSON (progress…, done with the run); closing the connection stops the draws",
    body: analysisInput,
    success: 200,
  },
  {
    method: "POST",
    path: "/api/analyses/batch",
    permission: "analysis.run",
    summary:
      "Fit one model over several versions of a manuscript on all cores, storing each run; progress streams back as NDJSON (start, one result per version, end); closing the connection stops the batch",
    body: batchInput,
    success: 200,
  },
  {
    method: "POST",
    path: "/api/analyses/global",
    permission: "analysis.run",
    summary:
      "Global fit: one model over 2–50 versions of a manuscript at once, the parameters named in `shared` taking one value for all, the others one per version; one covariance for all; nothing is stored",
    body: globalInput,
    success: 200,
  },
  {
    method: "POST",
    path: "/api/analyses/compare",
    permission: "analysis.run",
    summary:
      "Model comparison: 2–4 candidates (models, or one model with parameters held in `fixed`) fitted to the same columns of one version; χ²ᵣ, AIC with ΔAIC and Akaike weights, BIC, an F-test for each nested pair, residuals, and the preferred candidate with the reason; nothing is stored",
    body: comparisonInput,
    success: 200,
  },
  {
    method: "POST",
    path: "/api/analyses/scaling",
    permission: "analysis.run",
    summary: "Decoupling scaling T₂(N) = T₂(1)·N^s over stored runs (one point per run, N given per run, weighted by the runs' errors); nothing is stored",
    body: scalingInput,
    success: 200,
  },
  { method: "GET", path: "/api/analyses/{id}", permission: "manuscript.read", summary: "A stored analysis run", success: 200 },
  {
    method: "GET",
    path: "/api/manuscripts/{id}/statistics",
    permission: "manuscript.read",
    summary: "Population statistics of a fitted parameter by group",
    query: statisticsQuery,
    success: 200,
  },
  {
    method: "POST",
    path: "/api/calculators/{id}",
    permission: "model.list",
    summary: "Run a calculator (an estimate, not a calibration)",
    body: calculatorInput,
    success: 200,
  },
  { method: "GET", path: "/api/manuscripts/{id}/house-style", permission: "manuscript.read", summary: "The house style figure exports use", success: 200 },
  {
    method: "PUT",
    path: "/api/manuscripts/{id}/house-style",
    permission: "figure.edit",
    summary: "Set the house style: font, text sizes, line widths, panel letters",
    body: houseStyleSchema,
    success: 200,
  },
  {
    method: "GET",
    path: "/api/manuscripts/{id}/figures",
    permission: "manuscript.read",
    summary: "Figures with their panels (archived ones left out; ?archived=1 lists only those)",
    query: archivedQuery,
    success: 200,
  },
  { method: "POST", path: "/api/figures", permission: "figure.edit", summary: "Create a figure", body: createFigureInput, success: 201 },
  { method: "GET", path: "/api/figures/{id}", permission: "manuscript.read", summary: "A figure with its lettered panels", success: 200 },
  {
    method: "PATCH",
    path: "/api/figures/{id}",
    permission: "figure.edit",
    summary: "Change title, width, columns, required reviewers",
    body: updateFigureInput,
    success: 200,
  },
  {
    method: "POST",
    path: "/api/figures/{id}/panels",
    permission: "figure.edit",
    summary: "Add a panel (answers its letter)",
    body: addPanelInput,
    success: 201,
  },
  { method: "POST", path: "/api/figures/{id}/order", permission: "figure.edit", summary: "Reorder panels (re-lettered)", body: reorderInput, success: 200 },
  {
    method: "GET",
    path: "/api/panels/{id}",
    permission: "manuscript.read",
    summary: "A panel with current revision, review state, decisions and data warnings",
    success: 200,
  },
  { method: "GET", path: "/api/panels/{id}/revisions", permission: "manuscript.read", summary: "A panel's revisions, newest first", success: 200 },
  {
    method: "POST",
    path: "/api/panels/{id}/revisions",
    permission: "figure.edit",
    summary:
      "New revision with its revision note (409 when baseRevisionId is not current; 422 when the spec names a field the bound data lacks, with the columns there are)",
    body: revisionInput,
    success: 201,
  },
  { method: "GET", path: "/api/revisions/{id}", permission: "manuscript.read", summary: "One revision with its canonical spec and bindings", success: 200 },
  {
    method: "GET",
    path: "/api/revisions/{id}/data",
    permission: "manuscript.read",
    summary: "Bound rows for display (long series reduced, extremes kept) and data warnings (missing fields, no rows, rows left out)",
    success: 200,
  },
  {
    method: "GET",
    path: "/api/figures/{id}/export",
    permission: "manuscript.export",
    summary: "The figure as SVG, PDF or PNG at print size; its source data; the RO-Crate bundle",
    query: exportQuery,
    success: 200,
  },
  {
    method: "POST",
    path: "/api/manuscripts/{id}/bundles/import",
    permission: "bundle.import",
    summary:
      "Import a reproducibility bundle into this manuscript: checked in full first (as /api/bundles/verify; a bundle that does not verify or is unsafe to unpack is refused with 422 and nothing is written), then its datasets (same bytes and hashes), fits (the recorded runs) and figure (panels, one revision each) are recreated, marked imported from the bundle's sha256; review decisions and sign-offs are not carried over",
    multipart: { file: "the bundle's .zip as exported (GET /api/figures/{id}/export?format=bundle); binary" },
    success: 201,
  },
  {
    method: "POST",
    path: "/api/bundles/verify",
    permission: "bundle.verify",
    summary:
      "Check a reproducibility bundle from its own contents: every file's sha256, every raw file parsed again, every fit run again (1e-6 relative), the figure drawn again (identical SVG); answers { ok, rows: [{ item, check, match, detail }] }",
    multipart: { file: "the bundle's .zip as exported (GET /api/figures/{id}/export?format=bundle); binary" },
    success: 200,
  },
  {
    method: "GET",
    path: "/api/figures/{id}/trace",
    permission: "manuscript.read",
    summary: "Provenance chain with every hash, review decisions, sign-offs and exports; format=prov gives W3C PROV-JSON",
    query: traceQuery,
    success: 200,
  },
  {
    method: "GET",
    path: "/api/figures/{id}/print-check",
    permission: "manuscript.read",
    summary:
      "Print check of the figure as drawn at its width: text ≥ 5 pt, width and maximum height, axis units, data colours apart under deuteranopia/protanopia/tritanopia (Machado 2009, ΔE00 ≥ 10), error bars defined, n for grouped data, raster ≥ 300 dpi, latest data versions; answers { ok, figureHash, items: [{ id, label, ok, problems, detail }] }",
    success: 200,
  },
  {
    method: "GET",
    path: "/api/figures/{id}/thumbnail",
    permission: "manuscript.read",
    summary: "The figure as a small PNG, drawn on first request and cached by figure hash (ETag); a placeholder when it has no panels",
    query: thumbnailQuery,
    success: 200,
  },
  {
    method: "GET",
    path: "/api/panels/{id}/thumbnail",
    permission: "manuscript.read",
    summary: "A panel's current revision as a small PNG, cached by content hash (ETag); a placeholder when it has no revision",
    query: thumbnailQuery,
    success: 200,
  },
  { method: "GET", path: "/api/panels/{id}/threads", permission: "manuscript.read", summary: "Threads on a panel with their comments", success: 200 },
  {
    method: "POST",
    path: "/api/panels/{id}/threads",
    permission: "comment.write",
    summary: "Start a thread on a revision (optional anchor)",
    body: newThreadInput,
    success: 201,
  },
  {
    method: "POST",
    path: "/api/threads/{id}/comments",
    permission: "comment.write",
    summary: "Reply in a thread: answers the whole thread, or only the new comment (with its threadId) when asked",
    body: replyInput,
    headers: { Prefer: "`return=minimal` (RFC 7240): answer only the new comment; the answer then carries `Preference-Applied: return=minimal`" },
    success: 201,
  },
  { method: "POST", path: "/api/threads/{id}/resolve", permission: "comment.write", summary: "Resolve (or reopen) a thread", body: resolveInput, success: 200 },
  {
    method: "POST",
    path: "/api/threads/{id}/follow",
    permission: "manuscript.read",
    summary: "Follow (or stop following) a thread's replies by mail",
    body: threadFollowInput,
    success: 200,
  },
  {
    method: "PATCH",
    path: "/api/comments/{id}",
    permission: "comment.write",
    summary: "Edit one's comment within 15 minutes",
    body: editCommentInput,
    success: 200,
  },
  { method: "DELETE", path: "/api/comments/{id}", permission: "comment.write", summary: "Delete one's comment while nobody replied", success: 200 },
  {
    method: "POST",
    path: "/api/panels/{id}/approvals",
    permission: "review.decide",
    summary: "Approve or ask for revision on the current content hash",
    body: decisionInput,
    success: 201,
  },
  {
    method: "POST",
    path: "/api/figures/{id}/signoff",
    permission: "figure.signoff",
    summary: "PI sign-off of the figure hash",
    body: signoffInput,
    success: 201,
  },
  {
    method: "POST",
    path: "/api/figures/{id}/signoff/withdraw",
    permission: "figure.signoff",
    summary: "PI withdraws a sign-off with a reason (kept on record, no longer counts)",
    body: withdrawSignoffInput,
    success: 200,
  },
  {
    method: "POST",
    path: "/api/panels/{id}/send-to-review",
    permission: "figure.edit",
    summary: "Send a draft panel to review (reviewers are asked)",
    success: 200,
  },
  ...(["datasets", "analyses", "panels", "figures"] as const).flatMap((things): ApiOperation[] => [
    {
      method: "POST",
      path: `/api/${things}/{id}/archive`,
      permission: "archive.manage",
      summary: "Archive (archived: true) or restore (false); it leaves lists and pickers and stays resolvable from every trace",
      body: archiveInput,
      success: 200,
    },
    {
      method: "DELETE",
      path: `/api/${things}/{id}`,
      permission: "archive.delete",
      summary: "Delete an archived thing for good; 409 names what still references it",
      success: 200,
    },
  ]),
  { method: "GET", path: "/api/review-queue", permission: "self.read", summary: "What waits on the caller", success: 200 },
  { method: "GET", path: "/api/manuscripts/{id}/activity", permission: "manuscript.read", summary: "The audit log in words", success: 200 },
];

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
