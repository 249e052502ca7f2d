/** Progress of a batch (or of bootstrap draws), as a bar with numbers beside it (the bar is never the only sign). */
export function BatchProgress({
  done,
  total,
  failed,
  label = "Batch fit progress",
  noun = "fits",
}: {
  done: number;
  total: number;
  failed: number;
  label?: string;
  noun?: string;
}) {
  const pct = total ? Math.round((done / total) * 100) : 0;
  return (
    <div className="flex items-center gap-3">
      <div
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={total}
        aria-valuenow={done}
        aria-valuetext={`${done} of ${total} ${noun}`}
        className="h-3 flex-1 overflow-hidden rounded-sm border border-rule bg-paper"
      >
        <div className="h-full bg-accent transition-[width]" style={{ width: `${pct}%` }} />
      </div>
      <span className="whitespace-nowrap text-sm tabular-nums" data-testid="batch-progress-text">
        {done}/{total} {noun}
        {failed ? (
          <span className="text-bad">
            {" "}
            · <span aria-hidden>✕ </span>
            {failed} failed
          </span>
        ) : null}
      </span>
    </div>
  );
}
