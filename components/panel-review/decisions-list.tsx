import type { PanelView } from "@/components/figures/api";
import { shortHash } from "@/lib/data/format";
import { RelativeTime } from "@/components/review/relative-time";

/** Every decision, newest first; those on an older content hash are marked stale with what changed since. */
export function DecisionsList({ decisions }: { decisions: PanelView["decisions"] }) {
  if (!decisions.length) return <p className="text-sm text-muted">No decisions yet.</p>;
  return (
    <ul className="space-y-2 text-sm" aria-label="Decisions">
      {[...decisions].reverse().map((d) => (
        <li
          key={d.id}
          className={`rounded-sm border p-2 ${d.stale ? "border-dashed border-rule bg-paper" : "border-rule bg-sheet"}`}
          data-testid="decision"
          data-stale={d.stale}
        >
          <p className="flex flex-wrap items-center gap-x-2">
            <b className={d.decision === "approved" ? "text-good" : "text-bad"}>{d.decision === "approved" ? "✓ Approved" : "✕ Needs revision"}</b>
            <span>{d.userName}</span>
            <span className="text-xs text-muted">
              <RelativeTime at={d.createdAt} /> · hash <code>{shortHash(d.contentHash, 8)}</code>
            </span>
            {d.stale ? <span className="ml-auto rounded-full border border-warn px-1.5 text-xs font-medium text-warn">◌ Stale</span> : null}
          </p>
          {d.note ? <p className="mt-1 text-xs">“{d.note}”</p> : null}
          {d.stale ? (
            <div className="mt-1 text-xs text-warn">
              <p>Made on an earlier revision. Since then:</p>
              <ul className="list-disc pl-5">{d.changes.length ? d.changes.map((c, i) => <li key={i}>{c.text}</li>) : <li>the content changed</li>}</ul>
            </div>
          ) : null}
        </li>
      ))}
    </ul>
  );
}
