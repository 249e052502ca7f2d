import { exportQuery } from "@/lib/server/export/export-figure";
import { traceQuery } from "@/lib/server/figures/trace";
import { thumbnailQuery } from "@/lib/server/export/thumbnails";
import { decisionInput, editCommentInput, newThreadInput, replyInput, resolveInput, signoffInput } from "@/lib/server/review/schemas";
import { threadFollowInput } from "@/lib/server/review/thread-follows";
import { withdrawSignoffInput } from "@/lib/server/review/review-edges";
import { archiveInput, archivedQuery } from "@/lib/server/archive/archive";
import { addPanelInput, createFigureInput, reorderInput, revisionInput, updateFigureInput } from "@/lib/server/figures/schemas";

import type { ApiOperation } from "./api-catalogue";

/** Figures, panels, revisions, exports, threads, decisions, sign-offs and archive: the second half of the catalogue. */
export const FIGURE_AND_REVIEW_OPERATIONS: ApiOperation[] = [
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
