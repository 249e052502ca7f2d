/**
 * Confocal PL scan: a 60 × 60 matrix of count rates (counts/s) over 20 µm × 20 µm, x axis in
 * the first row and y axis in the first column (µm), with Gaussian spots (one per single NV
 * centre) on a flat background and Poisson counting noise for the pixel dwell time.
 */
import type { DemoFile } from "./types";
import { Rng } from "./prng";
import { fixed, gauss } from "./numeric";
import { CONFOCAL, SAMPLE, commentHeader, measuredAt, standardHeader } from "./scenario";

const PL_MAP_PIXELS = 60;
const PL_MAP_SIZE_UM = 20;
const PL_MAP_SPOTS = 25;
const PSF_FWHM_UM = 0.35;
const BACKGROUND_CPS = 5_000;
const DWELL_S = 0.01;

interface PlSpot {
  x: number;
  y: number;
  peak: number;
}

export function plMapFiles(): DemoFile[] {
  const rng = new Rng("pl-map/K17-annealed/scan-07");
  const group = "annealed-1200C" as const;
  const pitch = PL_MAP_SIZE_UM / PL_MAP_PIXELS;
  const axis = Array.from({ length: PL_MAP_PIXELS }, (_, i) => i * pitch);
  const spots: PlSpot[] = Array.from({ length: PL_MAP_SPOTS }, () => ({
    x: rng.between(0.5, PL_MAP_SIZE_UM - 0.5),
    y: rng.between(0.5, PL_MAP_SIZE_UM - 0.5),
    peak: rng.between(60_000, 120_000),
  }));

  const rows: string[] = ["," + axis.map((v) => fixed(v, 3)).join(",")];
  for (const y of axis) {
    const cells = [fixed(y, 3)];
    for (const x of axis) {
      let rate = BACKGROUND_CPS * (1 + 0.04 * (x / PL_MAP_SIZE_UM - 0.5));
      for (const s of spots) rate += s.peak * gauss(x, s.x, PSF_FWHM_UM) * gauss(y, s.y, PSF_FWHM_UM);
      cells.push(String(Math.round(rng.poisson(rate * DWELL_S) / DWELL_S)));
    }
    rows.push(cells.join(","));
  }

  const when = measuredAt(2, 3, 10, 15);
  const header = commentHeader([
    ["title", "confocal PL scan 07"],
    ...standardHeader(CONFOCAL, group, when),
    ["excitation", "532 nm, 0.5 mW before objective"],
    ["detection", "650-800 nm long-pass, APD"],
    ["scan range", `${PL_MAP_SIZE_UM} µm x ${PL_MAP_SIZE_UM} µm`],
    ["pixels", `${PL_MAP_PIXELS} x ${PL_MAP_PIXELS}`],
    ["pixel size", `${fixed(pitch, 3)} µm`],
    ["dwell time", `${DWELL_S * 1000} ms`],
    ["values", "count rate (counts/s); first row x (µm), first column y (µm)"],
  ]);

  const density = PL_MAP_SPOTS / (PL_MAP_SIZE_UM * PL_MAP_SIZE_UM);
  return [
    {
      fileName: `plmap_${SAMPLE}-annealed_scan07.csv`,
      name: `PL scan 07, annealed region (sample ${SAMPLE})`,
      kind: "pl_map",
      sample: SAMPLE,
      instrument: CONFOCAL,
      measuredAt: when,
      notes:
        `Generated: ${PL_MAP_SPOTS} Gaussian spots (PSF FWHM ${PSF_FWHM_UM} µm, peak 60–120 kcounts/s) ` +
        `on a ${BACKGROUND_CPS / 1000} kcounts/s background (±2 % tilt in x), Poisson noise for a ` +
        `${DWELL_S * 1000} ms dwell. True areal density ${PL_MAP_SPOTS}/${PL_MAP_SIZE_UM * PL_MAP_SIZE_UM} µm² = ` +
        `${density} µm⁻². Spots may overlap; counting can find slightly fewer.`,
      tags: { group, scan: "07" },
      content: header + rows.join("\n") + "\n",
    },
  ];
}
