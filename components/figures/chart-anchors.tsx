"use client";
import { useRef, useState, type PointerEvent } from "react";
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

/**
 * Review anchors drawn over a rendered plot (an absolutely positioned SVG in screen pixels), and
 * the picking of a new one: a click for a point, a drag for an x-range, read through the scales.
 */
export function ChartAnchors({
  geometry,
  scale,
  width,
  height,
  anchors,
  pickMode,
  onPick,
}: {
  geometry: PlotGeometry;
  scale: number;
  width: number;
  height: number;
  anchors: ChartAnchor[];
  pickMode: PickMode;
  onPick?: (a: ThreadAnchor) => void;
}) {
  const ref = useRef<SVGSVGElement>(null);
  const [drag, setDrag] = useState<{ from: number; to: number } | null>(null);
  const g = geometry;
  const px = (u: number) => u * scale;
  const xOf = (v: number) => (g.x ? px(g.left + g.x(v)) : NaN);
  const yOf = (v: number) => (g.y ? px(g.top + g.y(v)) : NaN);
  const plot = { x: px(g.left), y: px(g.top), w: px(g.width), h: px(g.height) };
  const canPick = pickMode !== "none" && Boolean(g.x) && (pickMode === "xrange" || Boolean(g.y));

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
    const [a, b] = [invertX(Math.min(drag.from, to)), invertX(Math.max(drag.from, to))];
    onPick({ type: "xrange", x0: Math.min(a, b), x1: Math.max(a, b) });
  }

  return (
    <svg
      ref={ref}
      width={width}
      height={height}
      className="pointer-events-none absolute left-0 top-0 overflow-visible"
      aria-hidden={!canPick}
      data-testid="chart-anchors"
    >
      {anchors.map((a) => (
        <AnchorMark key={a.id} a={a} xOf={xOf} yOf={yOf} plot={plot} />
      ))}
      {drag && pickMode === "xrange" ? (
        <rect
          x={Math.min(drag.from, drag.to)}
          y={plot.y}
          width={Math.abs(drag.to - drag.from)}
          height={plot.h}
          fill={DRAFT}
          fillOpacity={0.15}
          stroke={DRAFT}
          strokeWidth={1}
        />
      ) : null}
      {canPick ? (
        <rect
          data-testid="pick-overlay"
          x={plot.x}
          y={plot.y}
          width={plot.w}
          height={plot.h}
          fill="transparent"
          className="pointer-events-auto cursor-crosshair touch-none"
          onPointerDown={onDown}
          onPointerMove={onMove}
          onPointerUp={onUp}
        >
          <title>{pickMode === "point" ? "Click the point to mark" : "Drag across the x-range to mark"}</title>
        </rect>
      ) : null}
    </svg>
  );
}

function AnchorMark({
  a,
  xOf,
  yOf,
  plot,
}: {
  a: ChartAnchor;
  xOf: (v: number) => number;
  yOf: (v: number) => number;
  plot: { x: number; y: number; w: number; h: number };
}) {
  const color = a.draft ? DRAFT : INK;
  const dash = a.stale ? "3 2" : undefined;
  const text = (x: number, y: number, anchor: "start" | "end") => (
    <text x={x} y={y} fontSize={10} fill={color} textAnchor={anchor} stroke="white" strokeWidth={3} paintOrder="stroke" fontWeight={600}>
      {a.label}
    </text>
  );
  if (a.anchor.type === "point") {
    const cx = xOf(a.anchor.x),
      cy = yOf(a.anchor.y);
    if (!Number.isFinite(cx) || !Number.isFinite(cy)) return null;
    const right = cx < plot.x + plot.w - 80;
    return (
      <g data-anchor={a.id}>
        <title>{a.label}</title>
        <circle cx={cx} cy={cy} r={6} fill="none" stroke={color} strokeWidth={1.5} strokeDasharray={dash} />
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
    <g data-anchor={a.id}>
      <title>{a.label}</title>
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
      {text(left + 3, plot.y + 11, "start")}
    </g>
  );
}
