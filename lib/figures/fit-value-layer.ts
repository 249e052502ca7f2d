/**
 * "Show fitted value": a text layer drawing one fitted parameter of a stored run ("T₂ = 38.7 ± 0.7 µs")
 * in a corner of the plot. The text is not written into the spec: the layer reads the `text` column
 * of a data name bound to the run's parameters, so the value is the run's and goes stale with it.
 */
import type { TopLevelSpec } from "vega-lite";
import type { FigureTemplate } from "./plots/types";

export const FIT_VALUE_POSITIONS = [
  { value: "top-right", label: "top right" },
  { value: "top-left", label: "top left" },
  { value: "bottom-right", label: "bottom right" },
  { value: "bottom-left", label: "bottom left" },
] as const;
type Position = (typeof FIT_VALUE_POSITIONS)[number]["value"];

/** The builder option, recorded with the template's options under `fitValue`. */
export interface FitValueOption {
  /** The data name bound to the run's parameters. */
  data: string;
  /** The parameter's name in the run (e.g. "T2"). */
  parameter: string;
  position: Position;
}

type Spec = Record<string, unknown>;
const isSpec = (v: unknown): v is Spec => typeof v === "object" && v !== null && !Array.isArray(v);

/** The option from recorded options, or null when the value is not shown (or the record is malformed). */
export function readFitValueOption(options: Record<string, unknown>): FitValueOption | null {
  const o = options.fitValue;
  if (!isSpec(o) || typeof o.data !== "string" || typeof o.parameter !== "string" || !o.data || !o.parameter) return null;
  const position = FIT_VALUE_POSITIONS.find((p) => p.value === o.position)?.value ?? "top-right";
  return { data: o.data, parameter: o.parameter, position };
}

/** The text layer for one parameter, placed 4 px in from the corner of the plot area. */
function fitValueLayer(o: FitValueOption): Spec {
  const right = o.position.endsWith("right");
  const bottom = o.position.startsWith("bottom");
  return {
    data: { name: o.data },
    transform: [{ filter: { field: "name", equal: o.parameter } }],
    mark: {
      type: "text",
      align: right ? "right" : "left",
      baseline: bottom ? "bottom" : "top",
      x: right ? "width" : 0,
      y: bottom ? "height" : 0,
      dx: right ? -4 : 4,
      dy: bottom ? -4 : 4,
    },
    encoding: { text: { field: "text", type: "nominal" } },
  };
}

/** The spec with the text layer added to its (first) plot; unchanged when the option is off. */
export function addFitValueLayer(spec: TopLevelSpec, o: FitValueOption | null): TopLevelSpec {
  if (!o) return spec;
  const s = spec as unknown as Spec;
  const layer = fitValueLayer(o);
  if (Array.isArray(s.layer)) return { ...s, layer: [...(s.layer as unknown[]), layer] } as unknown as TopLevelSpec;
  if (Array.isArray(s.vconcat) && isSpec(s.vconcat[0])) {
    const [first, ...rest] = s.vconcat as Spec[];
    const plot: Spec = Array.isArray(first.layer) ? { ...first, layer: [...(first.layer as unknown[]), layer] } : withLayer(first, layer);
    return { ...s, vconcat: [plot, ...rest] } as unknown as TopLevelSpec;
  }
  return withLayer(s, layer) as unknown as TopLevelSpec;
}

/** A single-view spec turned into layers: its mark (with encoding and transforms) first, then the text. */
function withLayer(s: Spec, layer: Spec): Spec {
  if (!("mark" in s)) return s;
  const { mark, encoding, transform, params, ...rest } = s;
  const own: Spec = { mark, ...(encoding ? { encoding } : {}), ...(transform ? { transform } : {}), ...(params ? { params } : {}) };
  return { ...rest, layer: [own, layer] };
}

/** The template with "Show fitted value" added to what it builds (from its recorded `fitValue` option). */
export function withFitValue<O extends Record<string, unknown>>(t: FigureTemplate<O>): FigureTemplate<O> {
  return {
    ...t,
    dataNames: (options) => {
      const fv = readFitValueOption(options);
      return [...t.dataNames(options), ...(fv ? [fv.data] : [])];
    },
    build: (options) => addFitValueLayer(t.build(options), readFitValueOption(options)),
  };
}
