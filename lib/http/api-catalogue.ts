import { z } from "zod";
import type { Action } from "@/lib/authz/policy";
import { FIGURE_AND_REVIEW_OPERATIONS } from "./api-operations-figures";
import { createTokenInput } from "@/lib/server/api-tokens";
import { createManuscriptInput } from "@/lib/server/manuscripts";
import { changeRoleInput, inviteInput } from "@/lib/server/members";
import { metadataInput, plotQuery, rowsQuery } from "@/lib/server/datasets/schemas";
import { houseStyleSchema } from "@/lib/figures/house-style";
import { analysisInput, batchInput, calculatorInput, globalInput, comparisonInput, statisticsQuery } from "@/lib/server/analyses/schemas";
import { scalingInput } from "@/lib/server/analyses/scaling";
import { archivedQuery } from "@/lib/server/archive/archive";

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
  ...FIGURE_AND_REVIEW_OPERATIONS,
];
