/** The colour rule: data colours distinguishable under deuteranopia, protanopia and tritanopia. */
import { converter, differenceCiede2000, parse, type Color } from "culori";
import type { SvgMarkColours } from "./svg-reading";
import { round1, type PrintCheckItem } from "./types";

/**
 * Smallest CIEDE2000 difference between two data colours under each simulated deficiency. ΔE00 ≈ 1
 * is the just-noticeable difference for large uniform patches; plot marks are small and thin, so the
 * check asks for ten times that. Every pair of Okabe & Ito's palette passes (the closest: orange vs
 * reddish purple under tritanopia, ΔE00 10.87); Tableau's red and green (#D62728, #2CA02C) fail
 * under deuteranopia (ΔE00 4.61).
 */
export const MIN_CVD_DELTA_E00 = 10;
/** A mark group with more distinct colours than this draws a continuous colour scale. */
const CONTINUOUS_COLOURS = 12;

export type Deficiency = "deuteranopia" | "protanopia" | "tritanopia";
const DEFICIENCIES: Deficiency[] = ["deuteranopia", "protanopia", "tritanopia"];

/**
 * Machado, G. M., Oliveira, M. M. & Fernandes, L. A. F. (2009), "A Physiologically-based Model for
 * Simulation of Color Vision Deficiency", IEEE TVCG 15(6):1291–1298, doi:10.1109/TVCG.2009.113:
 * the precomputed matrices for severity 1.0 (dichromacy), rows r, g, b. They are linear maps of the
 * display's primaries, so they act on linear-light RGB (as the colorspace R package applies them).
 */
export const MACHADO_2009: Record<Deficiency, readonly [readonly number[], readonly number[], readonly number[]]> = {
  protanopia: [
    [0.152286, 1.052583, -0.204868],
    [0.114503, 0.786281, 0.099216],
    [-0.003882, -0.048116, 1.051998],
  ],
  deuteranopia: [
    [0.367322, 0.860646, -0.227968],
    [0.280085, 0.672501, 0.047413],
    [-0.01182, 0.04294, 0.968881],
  ],
  tritanopia: [
    [1.255528, -0.076749, -0.178779],
    [-0.078411, 0.930809, 0.147602],
    [0.004733, 0.691367, 0.3039],
  ],
};

const toLrgb = converter("lrgb");
const deltaE00 = differenceCiede2000();
const clamp01 = (v: number) => Math.min(1, Math.max(0, v));

/** A CSS colour as a dichromat sees it (sRGB in, linear RGB out, clipped to the gamut); undefined when unreadable. */
function simulateDeficiency(colour: string | Color, kind: Deficiency): Color | undefined {
  const c = toLrgb(typeof colour === "string" ? parse(colour) : colour);
  if (!c) return undefined;
  const [r, g, b] = MACHADO_2009[kind].map((row) => clamp01(row[0] * c.r + row[1] * c.g + row[2] * c.b));
  return { mode: "lrgb", r, g, b };
}

/** CIEDE2000 difference of two colours (Sharma, Wu & Dalal 2005), as seen with normal vision or a deficiency. */
export function cvdDeltaE(a: string, b: string, kind: Deficiency | "normal"): number {
  if (kind === "normal") return deltaE00(a, b);
  const sa = simulateDeficiency(a, kind);
  const sb = simulateDeficiency(b, kind);
  if (!sa || !sb) return Number.NaN;
  return deltaE00(sa, sb);
}

/** Opaque, readable, not the paper's white. */
function dataColour(c: string): string | null {
  const p = parse(c);
  if (!p || (p.alpha !== undefined && p.alpha === 0)) return null;
  const rgb = converter("rgb")(p);
  const hex = [rgb.r, rgb.g, rgb.b].map((v) => Math.round(clamp01(v) * 255));
  if (hex.every((v) => v === 255)) return null;
  return `#${hex.map((v) => v.toString(16).padStart(2, "0")).join("")}`;
}

export function checkColourPairs(marks: SvgMarkColours[], threshold = MIN_CVD_DELTA_E00): PrintCheckItem {
  const byPanel = new Map<string, Set<string>>();
  const continuous = new Set<string>();
  for (const m of marks) {
    const set = byPanel.get(m.panel) ?? new Set<string>();
    byPanel.set(m.panel, set);
    const colours = [...new Set(m.colours.map(dataColour).filter((c): c is string => c !== null))];
    if (m.gradient || colours.length > CONTINUOUS_COLOURS) {
      continuous.add(m.panel);
      continue;
    }
    colours.forEach((c) => set.add(c));
  }
  const problems: string[] = [];
  let pairs = 0;
  for (const [panel, set] of byPanel) {
    const colours = [...set].sort();
    for (let i = 0; i < colours.length; i++) {
      for (let j = i + 1; j < colours.length; j++) {
        pairs++;
        for (const kind of DEFICIENCIES) {
          const d = cvdDeltaE(colours[i], colours[j], kind);
          if (!(d >= threshold))
            problems.push(`panel ${panel}: ${colours[i]} and ${colours[j]} differ by ΔE00 ${round1(d)} under ${kind} (at least ${threshold})`);
        }
      }
    }
  }
  const notes = [`${pairs} colour pair${pairs === 1 ? "" : "s"}`];
  if (continuous.size) notes.push(`continuous colour scale in panel ${[...continuous].join(", ")} not compared pairwise`);
  return {
    id: "colour-pairs",
    label: `Data colours apart under deuteranopia, protanopia and tritanopia (ΔE00 ≥ ${threshold}, Machado 2009)`,
    ok: problems.length === 0,
    problems,
    detail: notes.join("; "),
  };
}
