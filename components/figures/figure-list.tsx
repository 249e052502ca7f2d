import Link from "next/link";
import type { ReactNode } from "react";
import { STATE_LABELS, type ReviewState } from "@/lib/review/derive-state";
import { FigureThumbnail } from "./figure-thumbnail";
import { OpenThreads, ReviewStateBadge } from "./review-state";

export interface FigureListItem {
  id: string;
  number: number;
  title: string;
  widthMm: number;
  columns: number;
  reviewState: string;
  /** Names the thumbnail's URL, so a changed figure is fetched anew. */
  figureHash?: string | null;
  panels: Array<{ id: string; letter: string; colSpan: number; reviewState: string; openThreads: number }>;
}

/** The manuscript's figures: number, title, size, panels and review state, each opening the figure page. */
export function FigureList({ figures, actions }: { figures: FigureListItem[]; actions?: (f: FigureListItem) => ReactNode }) {
  return (
    <ul className="space-y-3" aria-label="Figures">
      {figures.map((f) => {
        const open = f.panels.reduce((n, p) => n + p.openThreads, 0);
        return (
          <li key={f.id} className={actions ? "flex flex-col gap-1 sm:flex-row sm:items-center sm:gap-2" : undefined}>
            <Link
              href={`/figures/${f.id}`}
              className="flex min-w-0 flex-1 items-center gap-4 rounded-sm border border-rule bg-sheet p-3 hover:border-accent hover:bg-accent-soft/40"
            >
              <FigureThumbnail figure={f} />
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
                <PanelStates figure={f} />
              </div>
              <span aria-hidden className="text-muted">
                →
              </span>
            </Link>
            {actions ? <div className="self-end sm:self-auto">{actions(f)}</div> : null}
          </li>
        );
      })}
    </ul>
  );
}

/** Each panel's letter with its state's shape and label (the thumbnail shows the figure; this, where it stands). */
function PanelStates({ figure }: { figure: FigureListItem }) {
  if (!figure.panels.length) return null;
  return (
    <ul className="mt-1 flex flex-wrap gap-x-3 text-xs text-muted" aria-label={`Panels of figure ${figure.number}`}>
      {figure.panels.map((p) => {
        const s = STATE_LABELS[p.reviewState as ReviewState] ?? { label: p.reviewState, shape: "?" };
        return (
          <li key={p.id}>
            <b className="text-ink">{p.letter}</b> <span aria-hidden>{s.shape}</span> {s.label.toLowerCase()}
          </li>
        );
      })}
    </ul>
  );
}
