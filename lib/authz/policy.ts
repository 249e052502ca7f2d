import type { Role } from "@/db/schema";

const everyone: readonly Role[] = ["pi", "author", "reviewer", "viewer"];
const writers: readonly Role[] = ["pi", "author"];
const commenters: readonly Role[] = ["pi", "author", "reviewer"];

/**
 * The one role → action table. Actions scoped to a manuscript are checked against the caller's
 * membership role; a caller with no membership gets 404 whatever the action.
 */
const MANUSCRIPT_POLICY = {
  "manuscript.read": everyone,
  "manuscript.export": everyone,
  "member.manage": ["pi"],
  "dataset.upload": writers,
  "dataset.edit": writers,
  "analysis.run": writers,
  "figure.edit": writers,
  /** Recreate a verified reproducibility bundle's data, fits and figure in this manuscript. */
  "bundle.import": writers,
  "comment.write": commenters,
  "review.decide": commenters,
  "figure.signoff": ["pi"],
  /** Archive and restore datasets, stored runs, panels and figures. */
  "archive.manage": writers,
  /** Delete an archived thing nothing references, for good. */
  "archive.delete": ["pi"],
} as const satisfies Record<string, readonly Role[]>;

export type ManuscriptAction = keyof typeof MANUSCRIPT_POLICY;
/** Actions that need only a signed-in user (they act on the caller's own things). */
/** `bundle.verify`: check a reproducibility bundle from its own contents (it belongs to no manuscript here). */
type UserAction = "self.read" | "self.tokens" | "self.mail" | "manuscript.list" | "manuscript.create" | "model.list" | "bundle.verify";
export type Action = ManuscriptAction | UserAction;

export function isManuscriptAction(action: Action): action is ManuscriptAction {
  return action in MANUSCRIPT_POLICY;
}

/** Whether a membership role may take the action; no role (not a member) allows nothing. Pure: pages and client components use it too. */
export function roleAllows(role: Role | null | undefined, action: ManuscriptAction): boolean {
  return role != null && (MANUSCRIPT_POLICY[action] as readonly Role[]).includes(role);
}

export const ROLE_LABELS: Record<Role, string> = {
  pi: "PI",
  author: "Author",
  reviewer: "Reviewer",
  viewer: "Viewer",
};
