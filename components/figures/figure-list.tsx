import Link from "next/link";
import { STATE_LABELS, type ReviewState } from "@/lib/review/derive-state";
import { OpenThreads, ReviewStateBadge } from "./review-state";

export interface FigureListItem {
  id: string;
  number: number;
  title: string;
  widthMm: number;
  columns: number;
  reviewState: string;
  panels: Array<{ id: string; letter: string; colSpan: number; reviewState: string; openThreads: number }>;
}

/** The manuscript's figures: number, title, size, panels and review state, each opening the figure page. */
export function FigureList({ figures }: { figures: FigureListItem[] }) {
  return (
    <ul className="space-y-3" aria-label="Figures">
      {figures.map((f) => {
        const open = f.panels.reduce((n, p) => n + p.openThreads, 0);
        return (
          <li key={f.id}>
            <Link
              href={`/figures/${f.id}`}
              className="flex items-center gap-4 rounded-sm border border-rule bg-sheet p-3 hover:border-accent hover:bg-accent-soft/40"
            >
              <FigureThumb figure={f} />
              <div className="min-w-0 flex-1">
                <p className="font-semibold">
                  <span className="text-muted">Figure {f.number}</span> · {f.title}
                </p>
                <p className="mt-0.5 text-xs text-muted tabular">
                  {f.widthMm} mm wide · {f.columns} column{f.columns === 1 ? "" : "s"} · {f.panels.length} panel{f.panels.length === 1 ? "" : "s"}
                </p>
                <p className="mt-1.5 flex flex-wrap items-center gap-2">
                  <ReviewStateBadge state={f.reviewState} />
                  <OpenThreads count={open} />
                </p>
              </div>
              <span aria-hidden className="text-muted">
                →
              </span>
            </Link>
          </li>
        );
      })}
    </ul>
  );
}

/** A light schematic of the layout (no chart library): panel letters on the grid with their state shape. */
function FigureThumb({ figure }: { figure: FigureListItem }) {
  const cols = Math.max(1, figure.columns);
  return (
    <div
      aria-hidden
      className="grid w-24 shrink-0 gap-0.5 rounded-sm border border-rule bg-white p-1"
      style={{ gridTemplateColumns: `repeat(${cols}, minmax(0, 1fr))`, aspectRatio: `${figure.widthMm} / 100` }}
    >
      {figure.panels.length === 0 ? <span className="col-span-full self-center text-center text-[10px] text-muted">empty</span> : null}
      {figure.panels.map((p) => (
        <span
          key={p.id}
          className="flex items-start justify-between rounded-[1px] bg-paper px-0.5 text-[9px] leading-tight"
          style={{ gridColumn: `span ${Math.min(cols, p.colSpan)}` }}
        >
          <b>{p.letter}</b>
          <span>{STATE_LABELS[p.reviewState as ReviewState]?.shape}</span>
        </span>
      ))}
    </div>
  );
}
