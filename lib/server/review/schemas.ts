import "server-only";
import { z } from "zod";

const anchor = z.union(
  [
    z.object({ type: z.literal("point"), x: z.number().refine(Number.isFinite), y: z.number().refine(Number.isFinite) }).strict(),
    z.object({ type: z.literal("xrange"), x0: z.number().refine(Number.isFinite), x1: z.number().refine(Number.isFinite) }).strict(),
  ],
  { message: 'anchor must be { type: "point", x, y } or { type: "xrange", x0, x1 }' },
);

const body = z.record(z.string(), z.unknown(), { message: "body must be a Tiptap JSON document" });

export const newThreadInput = z.object({
  body,
  revisionId: z.string().min(1, "revisionId is required").max(128),
  anchor: anchor.nullable().optional(),
  clientKey: z.string().max(80).optional(),
});
export const replyInput = z.object({ body, clientKey: z.string().max(80).optional() });
export const editCommentInput = z.object({ body, baseEditedAt: z.number().nullable().optional() });
export const resolveInput = z.object({ reopen: z.boolean().optional() });

export const decisionInput = z.object({
  revisionId: z.string().min(1, "revisionId is required").max(128),
  decision: z.enum(["approved", "needs_revision"], { message: 'decision must be "approved" or "needs_revision"' }),
  note: z.string().trim().max(5000).optional(),
  /** The decider saw the panel's data warnings (advisory: approvals are accepted either way; recorded in the audit entry). */
  acknowledgedWarnings: z.boolean().optional(),
});

export const signoffInput = z.object({
  figureHash: z.string().regex(/^[0-9a-f]{64}$/, "figureHash must be the figure's 64-hex content hash"),
  reason: z.string().trim().max(5000).optional(),
});
