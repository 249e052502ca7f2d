/**
 * Review state is derived, never stored: from the current content hash and the decisions on it.
 * draft → in review → needs revision / approved → signed off.
 */

export type ReviewState = "draft" | "in_review" | "needs_revision" | "approved" | "signed_off";
type Decision = "approved" | "needs_revision";

export interface DecisionRecord {
  userId: string;
  decision: Decision;
  contentHash: string;
  createdAt: number;
}

export interface PanelStateInput {
  currentHash: string | null;
  decisions: DecisionRecord[];
  /** Reviewers whose approval the figure requires; empty means one approval by anyone suffices. */
  requiredReviewers: string[];
  /** The figure is signed off on its current hash. */
  signedOff: boolean;
  /** The author sent the panel to review; false keeps it a draft whatever its revisions (absent counts as sent). */
  reviewRequested?: boolean;
}

export interface PanelState {
  state: ReviewState;
  approvedBy: string[];
  needsRevisionBy: string[];
  waitingOn: string[];
}

/** Each person's latest decision on the given hash (an approval can be withdrawn by a later "needs revision"). */
function latestDecisionsOn(hash: string, decisions: DecisionRecord[]): Map<string, DecisionRecord> {
  const latest = new Map<string, DecisionRecord>();
  for (const d of decisions) {
    if (d.contentHash !== hash) continue;
    const prev = latest.get(d.userId);
    if (!prev || prev.createdAt <= d.createdAt) latest.set(d.userId, d);
  }
  return latest;
}

export function panelReviewState(input: PanelStateInput): PanelState {
  if (!input.currentHash || input.reviewRequested === false) return { state: "draft", approvedBy: [], needsRevisionBy: [], waitingOn: [] };
  const latest = [...latestDecisionsOn(input.currentHash, input.decisions).values()];
  const approvedBy = latest
    .filter((d) => d.decision === "approved")
    .map((d) => d.userId)
    .sort();
  const needsRevisionBy = latest
    .filter((d) => d.decision === "needs_revision")
    .map((d) => d.userId)
    .sort();
  const waitingOn = input.requiredReviewers.filter((u) => !approvedBy.includes(u));
  const base = { approvedBy, needsRevisionBy, waitingOn };
  if (input.signedOff) return { state: "signed_off", ...base };
  if (needsRevisionBy.length) return { state: "needs_revision", ...base };
  const approved = input.requiredReviewers.length ? waitingOn.length === 0 : approvedBy.length > 0;
  return { state: approved ? "approved" : "in_review", ...base };
}

/** A figure is as far along as its least advanced panel; a sign-off on its current hash ends it. */
export function figureReviewState(panelStates: ReviewState[], signedOff: boolean): ReviewState {
  if (signedOff) return "signed_off";
  if (panelStates.length === 0 || panelStates.every((s) => s === "draft")) return "draft";
  if (panelStates.includes("needs_revision")) return "needs_revision";
  if (panelStates.every((s) => s === "approved" || s === "signed_off")) return "approved";
  return "in_review";
}

export const STATE_LABELS: Record<ReviewState, { label: string; shape: string }> = {
  draft: { label: "Draft", shape: "○" },
  in_review: { label: "In review", shape: "◐" },
  needs_revision: { label: "Needs revision", shape: "✕" },
  approved: { label: "Approved", shape: "✓" },
  signed_off: { label: "Signed off", shape: "◆" },
};
