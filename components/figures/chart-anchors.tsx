"use client";
import { useRef, useState, type KeyboardEvent, type PointerEvent } from "react";
import { formatNumber } from "@/lib/data/format";
import { parseHeaderUnit } from "@/lib/data/units";
import type { ThreadAnchor } from "./api";
import type { PlotGeometry } from "./vega-render";

export type PickMode = "none" | "point" | "xrange";
export interface ChartAnchor {
  id: string;
  anchor: ThreadAnchor;
  label: string;
  stale?: boolean;
  draft?: boolean;
}

const INK = "#a34700";
const DRAFT = "#1d4e89";
/** The focus ring drawn around a focused mark (the app's accent, as the global :focus-visible outline). */
const FOCUS = "#1d4e89";

/** Axis titles of the plot ("τ (µs)"), for the words of anchors; null when the spec has none. */
export interface AnchorAxes {
  x?: string | null;
  y?: string | null;
}

/** "τ = 2.1 µs", "x = 2.1": one coordinate with the axis' name and unit. */
function coordinate(title: string | null | undefined, fallback: string, v: number): string {
  const { name, unit } = parseHeaderUnit(title || fallback);
  return `${name} = ${formatNumber(v, 4)}${unit ? ` ${unit}` : ""}`;
}

/** What a screen reader says for an anchor: "point at τ = 2.1 µs, signal = 0.5", "τ from 2.1 to 3.4 µs". */
function anchorWords(a: ThreadAnchor, axes: AnchorAxes = {}): string {
  if (a.type === "point") return `point at ${coordinate(axes.x, "x", a.x)}, ${coordinate(axes.y, "y", a.y)}`;
  const { name, unit } = parseHeaderUnit(axes.x || "x");
  return `${name} from ${formatNumber(a.x0, 4)} to ${formatNumber(a.x1, 4)}${unit ? ` ${unit}` : ""}`;
}

/** Id of a thread's element in the review column (components/panel-review/thread-item.tsx; mail links point at it too). */
const threadElementId = (threadId: string) => `thread-${threadId}`;

/** Brings a thread of the review column into view and gives it focus; false when it is not on the page. */
export function focusThread(anchor: Pick<ChartAnchor, "id">): boolean {
  const el = typeof document === "undefined" ? null : document.getElementById(threadElementId(anchor.id));
  if (!el) return false;
  if (!el.hasAttribute("tabindex")) el.setAttribute("tabindex", "-1");
  el.scrollIntoView({ block: "nearest" });
  el.focus({ preventScroll: true });
  return true;
}

/**
 * Review anchors drawn over a rendered plot (an absolutely positioned SVG in screen pixels), and
 * the picking of a new one: a click for a point, a drag for an x-range, read through the scales.
 * With `onSelect`, each thread's mark is a button (Tab, then Enter or Space, or a click). While
 * picking, the plot area takes focus too: arrow keys move a cross (Shift: larger steps), Enter marks
 * the point, or the start and then the end of the x-range; Escape starts over.
 */
export function ChartAnchors({
  geometry,
  scale,
  width,
  height,
  anchors,
  pickMode,
  onPick,
  onSelect,
  axes = {},
}: {
  geometry: PlotGeometry;
  scale: number;
  width: number;
  height: number;
  anchors: ChartAnchor[];
  pickMode: PickMode;
  onPick?: (a: ThreadAnchor) => void;
  /** A thread's mark was activated (click, Enter or Space); not called for the draft mark. */
  onSelect?: (anchor: ChartAnchor) => void;
  axes?: AnchorAxes;
}) {
  const ref = useRef<SVGSVGElement>(null);
  const [drag, setDrag] = useState<{ from: number; to: number } | null>(null);
  const [keys, setKeys] = useState<{ x: number; y: number; from: number | null } | null>(null);
  const g = geometry;
  const px = (u: number) => u * scale;
  const xOf = (v: number) => (g.x ? px(g.left + g.x(v)) : NaN);
  const yOf = (v: number) => (g.y ? px(g.top + g.y(v)) : NaN);
  const plot = { x: px(g.left), y: px(g.top), w: px(g.width), h: px(g.height) };
  const canPick = pickMode !== "none" && Boolean(g.x) && (pickMode === "xrange" || Boolean(g.y));
  const selectable = Boolean(onSelect) && anchors.some((a) => !a.draft);

  const localX = (e: PointerEvent) => {
    const r = ref.current!.getBoundingClientRect();
    return Math.min(plot.x + plot.w, Math.max(plot.x, e.clientX - r.left));
  };
  const localY = (e: PointerEvent) => {
    const r = ref.current!.getBoundingClientRect();
    return Math.min(plot.y + plot.h, Math.max(plot.y, e.clientY - r.top));
  };
  const invertX = (screen: number) => g.x!.invert(screen / scale - g.left);
  const invertY = (screen: number) => g.y!.invert(screen / scale - g.top);
  const rangeOf = (from: number, to: number): ThreadAnchor => {
    const [a, b] = [invertX(Math.min(from, to)), invertX(Math.max(from, to))];
    return { type: "xrange", x0: Math.min(a, b), x1: Math.max(a, b) };
  };

  function onDown(e: PointerEvent<SVGRectElement>) {
    if (!canPick) return;
    e.currentTarget.setPointerCapture(e.pointerId);
    const x = localX(e);
    setDrag({ from: x, to: x });
  }
  function onMove(e: PointerEvent<SVGRectElement>) {
    if (drag && pickMode === "xrange") setDrag({ ...drag, to: localX(e) });
  }
  function onUp(e: PointerEvent<SVGRectElement>) {
    if (!drag || !onPick) return setDrag(null);
    const to = localX(e);
    setDrag(null);
    if (pickMode === "point") return onPick({ type: "point", x: invertX(to), y: invertY(localY(e)) });
    if (Math.abs(to - drag.from) < 3) return;
    onPick(rangeOf(drag.from, to));
  }

  /** The keyboard's cross: arrows move it, Enter marks. */
  function onKey(e: KeyboardEvent<SVGRectElement>) {
    if (!canPick || !keys) return;
    const step = e.shiftKey ? 10 : 50;
    const clampX = (v: number) => Math.min(plot.x + plot.w, Math.max(plot.x, v));
    const clampY = (v: number) => Math.min(plot.y + plot.h, Math.max(plot.y, v));
    const moves: Record<string, () => typeof keys> = {
      ArrowLeft: () => ({ ...keys, x: clampX(keys.x - plot.w / step) }),
      ArrowRight: () => ({ ...keys, x: clampX(keys.x + plot.w / step) }),
      ArrowUp: () => ({ ...keys, y: clampY(keys.y - plot.h / step) }),
      ArrowDown: () => ({ ...keys, y: clampY(keys.y + plot.h / step) }),
    };
    if (e.key === "Escape" && keys.from !== null) moves.Escape = () => ({ ...keys, from: null });
    if (moves[e.key]) {
      e.preventDefault();
      return setKeys(moves[e.key]());
    }
    if (e.key !== "Enter" && e.key !== " ") return;
    e.preventDefault();
    if (!onPick) return;
    if (pickMode === "point") return onPick({ type: "point", x: invertX(keys.x), y: invertY(keys.y) });
    if (keys.from === null) return setKeys({ ...keys, from: keys.x });
    if (Math.abs(keys.x - keys.from) < 1) return;
    setKeys({ ...keys, from: null });
    onPick(rangeOf(keys.from, keys.x));
  }
  const keysWords = (() => {
    if (!keys || !canPick) return "";
    if (pickMode === "point") return anchorWords({ type: "point", x: invertX(keys.x), y: invertY(keys.y) }, axes);
    if (keys.from === null) return `${coordinate(axes.x, "x", invertX(keys.x))}; Enter marks the start`;
    return `${anchorWords(rangeOf(keys.from, keys.x), axes)}; Enter marks the end`;
  })();
  const band = drag && pickMode === "xrange" ? drag : keys && keys.from !== null && pickMode === "xrange" ? { from: keys.from, to: keys.x } : null;

  return (
    <>
      <svg
        ref={ref}
        width={width}
        height={height}
        className="pointer-events-none absolute left-0 top-0 overflow-visible"
        aria-hidden={!canPick && !selectable}
        role={canPick || selectable ? "group" : undefined}
        aria-label={canPick || selectable ? "Review marks on the plot" : undefined}
        data-testid="chart-anchors"
      >
        {anchors.map((a) => (
          <AnchorMark
            key={a.id}
            a={a}
            xOf={xOf}
            yOf={yOf}
            plot={plot}
            name={`${a.draft ? "New comment" : "Comment thread"}: ${anchorWords(a.anchor, axes)} — ${a.label}`}
            onSelect={onSelect && !a.draft ? () => onSelect(a) : undefined}
          />
        ))}
        {band ? (
          <rect
            x={Math.min(band.from, band.to)}
            y={plot.y}
            width={Math.abs(band.to - band.from)}
            height={plot.h}
            fill={DRAFT}
            fillOpacity={0.15}
            stroke={DRAFT}
            strokeWidth={1}
            aria-hidden
          />
        ) : null}
        {keys && canPick ? (
          <g stroke={DRAFT} strokeWidth={1} aria-hidden data-testid="pick-cursor">
            <line x1={keys.x} x2={keys.x} y1={plot.y} y2={plot.y + plot.h} />
            {pickMode === "point" ? <line x1={plot.x} x2={plot.x + plot.w} y1={keys.y} y2={keys.y} /> : null}
          </g>
        ) : null}
        {canPick ? (
          <rect
            data-testid="pick-overlay"
            x={plot.x}
            y={plot.y}
            width={plot.w}
            height={plot.h}
            fill="transparent"
            stroke="transparent"
            strokeWidth={2}
            className="pointer-events-auto cursor-crosshair touch-none outline-none! focus-visible:stroke-accent"
            role="application"
            tabIndex={0}
            aria-label={
              pickMode === "point"
                ? "Mark a point: click it, or move the cross with the arrow keys (Shift for larger steps) and press Enter"
                : "Mark an x-range: drag across it, or move with the arrow keys (Shift for larger steps), Enter at the start and again at the end; Escape starts over"
            }
            onPointerDown={onDown}
            onPointerMove={onMove}
            onPointerUp={onUp}
            onFocus={() => setKeys((k) => k ?? { x: plot.x + plot.w / 2, y: plot.y + plot.h / 2, from: null })}
            onBlur={() => setKeys(null)}
            onKeyDown={onKey}
          >
            <title>{pickMode === "point" ? "Click the point to mark" : "Drag across the x-range to mark"}</title>
          </rect>
        ) : null}
      </svg>
      {canPick ? (
        <p className="sr-only" aria-live="polite" data-testid="pick-position">
          {keysWords}
        </p>
      ) : null}
    </>
  );
}

function AnchorMark({
  a,
  xOf,
  yOf,
  plot,
  name,
  onSelect,
}: {
  a: ChartAnchor;
  xOf: (v: number) => number;
  yOf: (v: number) => number;
  plot: { x: number; y: number; w: number; h: number };
  name: string;
  onSelect?: () => void;
}) {
  const color = a.draft ? DRAFT : INK;
  const dash = a.stale ? "3 2" : undefined;
  const text = (x: number, y: number, anchor: "start" | "end") => (
    <text x={x} y={y} fontSize={10} fill={color} textAnchor={anchor} stroke="white" strokeWidth={3} paintOrder="stroke" fontWeight={600}>
      {a.label}
    </text>
  );
  // A thread's mark is a button; the draft's is only a picture (its words are in the review column).
  const button = onSelect
    ? {
        role: "button",
        tabIndex: 0,
        "aria-label": name,
        className: "group pointer-events-auto cursor-pointer outline-none!",
        onClick: onSelect,
        onKeyDown: (e: KeyboardEvent<SVGGElement>) => {
          if (e.key !== "Enter" && e.key !== " ") return;
          e.preventDefault();
          onSelect();
        },
      }
    : { "aria-hidden": true };
  if (a.anchor.type === "point") {
    const cx = xOf(a.anchor.x),
      cy = yOf(a.anchor.y);
    if (!Number.isFinite(cx) || !Number.isFinite(cy)) return null;
    const right = cx < plot.x + plot.w - 80;
    return (
      <g data-anchor={a.id} {...button}>
        {onSelect ? null : <title>{a.label}</title>}
        {onSelect ? <circle cx={cx} cy={cy} r={12} fill="none" stroke={FOCUS} strokeWidth={2} className="invisible group-focus-visible:visible" /> : null}
        <circle cx={cx} cy={cy} r={6} fill={onSelect ? "transparent" : "none"} stroke={color} strokeWidth={1.5} strokeDasharray={dash} />
        <path d={`M${cx - 9},${cy} h5 M${cx + 4},${cy} h5 M${cx},${cy - 9} v5 M${cx},${cy + 4} v5`} stroke={color} strokeWidth={1} />
        {text(right ? cx + 9 : cx - 9, cy - 8, right ? "start" : "end")}
      </g>
    );
  }
  const x0 = xOf(a.anchor.x0),
    x1 = xOf(a.anchor.x1);
  if (!Number.isFinite(x0) || !Number.isFinite(x1)) return null;
  const left = Math.max(plot.x, Math.min(x0, x1)),
    right = Math.min(plot.x + plot.w, Math.max(x0, x1));
  return (
    <g data-anchor={a.id} {...button}>
      {onSelect ? null : <title>{a.label}</title>}
      <rect
        x={left}
        y={plot.y}
        width={Math.max(1, right - left)}
        height={plot.h}
        fill={color}
        fillOpacity={0.1}
        stroke={color}
        strokeWidth={1}
        strokeDasharray={dash ?? "0"}
      />
      {onSelect ? (
        <rect
          x={left - 3}
          y={plot.y - 3}
          width={Math.max(1, right - left) + 6}
          height={plot.h + 6}
          fill="none"
          stroke={FOCUS}
          strokeWidth={2}
          className="invisible group-focus-visible:visible"
        />
      ) : null}
      {text(left + 3, plot.y + 11, "start")}
    </g>
  );
}
