import { PX_PER_MM } from "@/components/figures/vega-render";

/** A millimetre ruler: a tick every mm (when they are far enough apart), longer every 5, numbered every 10. */
export function MmRuler({ lengthMm, zoom, orientation }: { lengthMm: number; zoom: number; orientation: "horizontal" | "vertical" }) {
  const perMm = PX_PER_MM * zoom;
  const length = lengthMm * perMm;
  const thick = 22;
  const ticks = [];
  const step = perMm >= 3 ? 1 : 5;
  for (let mm = 0; mm <= lengthMm + 1e-6; mm += step) {
    const at = mm * perMm;
    const size = mm % 10 === 0 ? 10 : mm % 5 === 0 ? 6 : 3;
    ticks.push(
      orientation === "horizontal" ? (
        <line key={mm} x1={at} x2={at} y1={thick} y2={thick - size} />
      ) : (
        <line key={mm} y1={at} y2={at} x1={thick} x2={thick - size} />
      ),
    );
  }
  const labelEvery = perMm * 10 < 22 ? 20 : 10;
  const labels = [];
  for (let mm = 0; mm <= lengthMm - 4; mm += labelEvery) {
    const at = mm * perMm;
    labels.push(
      orientation === "horizontal" ? (
        <text key={mm} x={at + 2} y={10}>
          {mm}
        </text>
      ) : (
        <text key={mm} x={2} y={at + 9}>
          {mm}
        </text>
      ),
    );
  }
  const w = orientation === "horizontal" ? length : thick;
  const h = orientation === "horizontal" ? thick : length;
  return (
    <svg width={w} height={h} className="block shrink-0 bg-sheet text-muted print:hidden" aria-hidden data-testid={`ruler-${orientation}`}>
      <g stroke="currentColor" strokeWidth={0.75}>
        {ticks}
      </g>
      <g fill="currentColor" fontSize={9} className="tabular">
        {labels}
      </g>
    </svg>
  );
}
