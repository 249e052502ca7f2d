import { STATE_LABELS, type ReviewState } from "@/lib/review/derive-state";

const LOOK: Record<ReviewState, string> = {
  draft: "border-rule bg-paper text-muted",
  in_review: "border-accent/40 bg-accent-soft text-accent",
  needs_revision: "border-bad/50 bg-[#fbeeee] text-bad",
  approved: "border-good/50 bg-[#e9f4ee] text-good",
  signed_off: "border-ink/60 bg-sheet text-ink",
};

export const STATE_ORDER: Record<ReviewState, number> = { draft: 0, in_review: 1, needs_revision: 2, approved: 3, signed_off: 4 };

export function isReviewState(s: string): s is ReviewState {
  return s in STATE_LABELS;
}

/** A review state as its label and its shape; the colour only repeats what the text says. */
export function StateBadge({ state, className = "" }: { state: string; className?: string }) {
  if (!isReviewState(state)) return <span className="text-xs text-muted">{state}</span>;
  const { label, shape } = STATE_LABELS[state];
  return (
    <span
      data-state={state}
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-medium ${LOOK[state]} ${className}`}
    >
      <span aria-hidden className="w-3 text-center">
        {shape}
      </span>
      {label}
    </span>
  );
}

const MEANING: Record<ReviewState, string> = {
  draft: "no revision yet",
  in_review: "awaiting approvals",
  needs_revision: "changes asked for",
  approved: "every required reviewer approved",
  signed_off: "the PI signed off this exact version",
};

/** Every state with its shape and what it means, in the order a figure moves through them. */
export function StateLegend() {
  const states = Object.keys(STATE_LABELS) as ReviewState[];
  return (
    <dl aria-label="Review states" className="flex flex-wrap gap-x-5 gap-y-2 text-xs">
      {states.map((s) => (
        <div key={s} className="flex items-center gap-1.5">
          <dt>
            <StateBadge state={s} />
          </dt>
          <dd className="text-muted">{MEANING[s]}</dd>
        </div>
      ))}
    </dl>
  );
}
