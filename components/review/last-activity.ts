import { toTime, type ActivityEntry, type BoardFigure, type BoardPanel } from "./review-api";

export interface LastActivity {
  at: number;
  who: string | null;
  text: string | null;
}

/** The newest audit entry per target ("panel:…", "revision:…", "figure:…"); the feed is newest first. */
export function latestByTarget(items: ActivityEntry[]): Map<string, ActivityEntry> {
  const out = new Map<string, ActivityEntry>();
  for (const e of items) if (!out.has(e.target)) out.set(e.target, e);
  return out;
}

function newest(candidates: Array<LastActivity | null>): LastActivity | null {
  return candidates.reduce<LastActivity | null>((best, c) => (c && (!best || c.at > best.at) ? c : best), null);
}

const fromEntry = (e: ActivityEntry | undefined): LastActivity | null => (e ? { at: toTime(e.at), who: e.actor, text: e.text } : null);

/** A panel's last activity: its decisions and revisions in the feed, else its current revision's date. */
export function panelLastActivity(p: BoardPanel, byTarget: Map<string, ActivityEntry>): LastActivity | null {
  const rev = p.currentRevision;
  return newest([
    fromEntry(byTarget.get(`panel:${p.id}`)),
    rev ? fromEntry(byTarget.get(`revision:${rev.id}`)) : null,
    rev ? { at: toTime(rev.createdAt), who: null, text: `revision ${rev.number} saved` } : null,
  ]);
}

export function figureLastActivity(f: BoardFigure, byTarget: Map<string, ActivityEntry>): LastActivity | null {
  return newest([
    fromEntry(byTarget.get(`figure:${f.id}`)),
    { at: toTime(f.createdAt), who: null, text: "figure created" },
    ...f.panels.map((p) => panelLastActivity(p, byTarget)),
  ]);
}
