import { STATE_LABELS, type ReviewState } from "@/lib/review/derive-state";

/** "in review", "needs revision": the state's label as it reads inside a sentence. */
const stateWords = (state: string) => (STATE_LABELS[state as ReviewState]?.label ?? state).toLowerCase();

/** Enough of a hash to make a new URL when it changes (the route accepts 8 to 64 hex digits). */
const hashTag = (hash: string | null | undefined) => (hash ? `?v=${hash.slice(0, 16)}` : "");

/**
 * What shows until the picture arrives (drawn on the first request, a few seconds): CSS content on a
 * hidden layer, so it is neither read out nor part of the surrounding text; the picture covers it.
 */
const WAITING = {
  drawing: "before:content-['drawing…']",
  empty: "before:content-['empty']",
} as const;

function Thumb({ src, alt, width, height, label }: { src: string; alt: string; width: number; height: number; label: keyof typeof WAITING }) {
  return (
    <span className="relative block shrink-0 overflow-hidden rounded-sm border border-rule bg-white" style={{ width, height }}>
      <span aria-hidden className={`absolute inset-0 flex items-center justify-center text-[10px] text-muted ${WAITING[label]}`} />
      {/* A plain <img>: the PNG is already small and sits behind the session gate, which Next's image optimiser would not pass. */}
      {/* eslint-disable-next-line @next/next/no-img-element */}
      <img src={src} alt={alt} width={width} height={height} loading="lazy" decoding="async" className="relative block h-full w-full object-contain" />
    </span>
  );
}

/** The figure as the server draws it (GET /api/figures/{id}/thumbnail), its alt text naming number, title and state. */
export function FigureThumbnail({
  figure,
  width = 160,
  height = 100,
}: {
  figure: { id: string; number: number; title: string; reviewState: string; figureHash?: string | null };
  width?: number;
  height?: number;
}) {
  return (
    <Thumb
      src={`/api/figures/${figure.id}/thumbnail${hashTag(figure.figureHash)}`}
      alt={`Figure ${figure.number}${figure.title.trim() ? `: ${figure.title.trim()}` : ""} — ${stateWords(figure.reviewState)}`}
      width={width}
      height={height}
      label="drawing"
    />
  );
}

/** One panel's current revision as the server draws it (GET /api/panels/{id}/thumbnail). */
export function PanelThumbnail({
  panel,
  width = 96,
  height = 60,
}: {
  panel: { id: string; letter: string; title?: string | null; reviewState: string; currentRevision: { contentHash: string } | null };
  width?: number;
  height?: number;
}) {
  const rev = panel.currentRevision;
  return (
    <Thumb
      src={`/api/panels/${panel.id}/thumbnail${hashTag(rev?.contentHash)}`}
      alt={`Panel ${panel.letter}${panel.title ? `: ${panel.title}` : ""} — ${rev ? stateWords(panel.reviewState) : "no revision yet"}`}
      width={width}
      height={height}
      label={rev ? "drawing" : "empty"}
    />
  );
}
