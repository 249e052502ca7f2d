import { STATE_LABELS, type ReviewState } from "@/lib/review/derive-state";

const TONE: Record<ReviewState, string> = {
  draft: "text-muted",
  in_review: "text-ink",
  needs_revision: "text-bad",
  approved: "text-good",
  signed_off: "text-accent",
};

/** A review state as its label and shape (never colour alone). */
export function ReviewStateBadge({ state, className = "" }: { state: string; className?: string }) {
  const s = STATE_LABELS[state as ReviewState] ?? { label: state, shape: "?" };
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border border-rule bg-sheet px-2 py-0.5 text-xs font-medium ${TONE[state as ReviewState] ?? ""} ${className}`}
      data-state={state}
    >
      <span aria-hidden>{s.shape}</span>
      {s.label}
    </span>
  );
}

export function OpenThreads({ count }: { count: number }) {
  return <span className="whitespace-nowrap text-xs text-muted">{count === 0 ? "no open threads" : `${count} open thread${count === 1 ? "" : "s"}`}</span>;
}
