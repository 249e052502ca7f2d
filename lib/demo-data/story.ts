/**
 * The demo manuscript in the middle of its review, as plain data for the seed
 * (lib/server/demo/demo-story.ts): the three figures' titles and layouts, the files the author
 * adds along the way (two population tables, the NV-NMR depth estimate, version 2 of the PL
 * spectrum) and what the reviewer and the author write. Invented like the rest of the demo;
 * no randomness here, so every seed tells the same story.
 */
import type { DemoFile } from "./types";
import { fixed, linSpace } from "./numeric";
import { CONFOCAL, LAB, SAMPLE } from "./scenario";
import { nmrDepthFromRmsField, nmrRmsField } from "@/lib/physics/nv-nmr";

/** Figure titles (the first one is the marker that the story has been told), widths and grid columns. */
export const STORY_FIGURES = {
  // Two columns: the echo decay spans both, the strip plots keep room for the group names below them.
  coherence: { title: "Coherence across surface treatments", widthMm: 183, columns: 2 },
  protons: { title: "Shallow NV proton sensing", widthMm: 183, columns: 3 },
  chargeState: { title: "Charge state and saturation", widthMm: 89, columns: 1 },
} as const;

/** A file the author uploads during the story, with the metadata the upload form would send. */
export interface StoryUpload {
  fileName: string;
  name: string;
  content: string;
  metadata: { kind: "other"; sample: string; instrument?: string; notes: string; tags: Record<string, string> };
}

/** One fitted parameter of one centre, as the statistics view lists it. */
export interface PopulationRow {
  centre: string;
  group: string;
  value: number;
  stderr: number | null;
}

const sig = (v: number | null, digits = 5) => (v === null || !Number.isFinite(v) ? "" : String(Number(v.toPrecision(digits))));

/**
 * A population table (one row per centre: centre, group, value, standard error) exported from
 * the statistics of stored fits and uploaded, so a strip-plot panel can bind it as a version.
 * Columns: `centre`, `group`, `<parameter> (<unit>)`, `<parameter>_err (<unit>)`.
 */
export function populationTable(parameter: "T2" | "T1", unit: string, modelTitle: string, rows: readonly PopulationRow[]): StoryUpload {
  const sorted = [...rows].sort((a, b) => a.centre.localeCompare(b.centre));
  const lines = [
    `# title: ${parameter} by sample group, ${sorted.length} stored ${modelTitle} fits`,
    `# lab: ${LAB}`,
    `# sample: ${SAMPLE}`,
    `# source: population statistics of ${parameter} grouped by the tag "group", latest stored run on each current version`,
    `centre,group,${parameter} (${unit}),${parameter}_err (${unit})`,
    ...sorted.map((r) => `${r.centre},${r.group},${sig(r.value)},${sig(r.stderr, 3)}`),
  ];
  return {
    fileName: `population_${SAMPLE}_${parameter}-by-group.csv`,
    name: `${parameter} by sample group, ${sorted.length} centres (sample ${SAMPLE})`,
    content: lines.join("\n") + "\n",
    metadata: {
      kind: "other",
      sample: SAMPLE,
      notes:
        `Exported from the population statistics of the stored ${modelTitle} fits (${sorted.length} centres, grouped by sample group) ` +
        `and uploaded for the strip plot; standard errors as the fits report them.`,
      tags: {},
    },
  };
}

/**
 * NV-NMR depth of NV12 from the RMS field of the oil's protons, B_rms² = ρ (μ0 ħ γp / 4π)² · 5π / (96 d³)
 * (lib/physics/nv-nmr): the measured B_rms is taken from the lab notebook (the filter-function
 * analysis of the XY8-16 dip is not part of the demo), the proton density of the oil is assumed.
 */
const DEPTH_INPUT = { centre: "NV12", brmsNt: 450, brmsErrNt: 40, protonDensityPerNm3: 60 } as const;

export function depthEstimate(): { depthNm: number; depthErrNm: number; file: StoryUpload } {
  const { centre, brmsNt, brmsErrNt, protonDensityPerNm3 } = DEPTH_INPUT;
  const rho = protonDensityPerNm3 * 1e27;
  const depthAt = (nT: number) => nmrDepthFromRmsField(nT * 1e-9, rho) * 1e9;
  const depthNm = depthAt(brmsNt);
  const depthErrNm = (depthAt(brmsNt - brmsErrNt) - depthAt(brmsNt + brmsErrNt)) / 2;
  const rows = linSpace(2, 30, 57).map((d) => `${fixed(d, 1)},${fixed(nmrRmsField(d * 1e-9, rho) * 1e9, 2)}`);
  const header = [
    `# title: NV-NMR depth estimate, ${centre}`,
    `# lab: ${LAB}`,
    `# sample: ${SAMPLE}`,
    `# model: B_rms^2 = rho (mu0 hbar gamma_p / 4 pi)^2 5 pi / (96 d^3), uniform proton layer above a flat surface`,
    `# proton density: ${protonDensityPerNm3} nm^-3 (immersion oil, assumed)`,
    `# measured B_rms: ${brmsNt} +- ${brmsErrNt} nT (XY8-16 dip, lab notebook)`,
    `# depth: ${fixed(depthNm, 1)} +- ${fixed(depthErrNm, 1)} nm`,
  ];
  return {
    depthNm,
    depthErrNm,
    file: {
      fileName: `nvnmr-depth_${SAMPLE}-${centre}.csv`,
      name: `NV-NMR depth estimate, ${centre} (sample ${SAMPLE})`,
      content: [...header, "depth (nm),B_rms (nT)", ...rows].join("\n") + "\n",
      metadata: {
        kind: "other",
        sample: SAMPLE,
        instrument: CONFOCAL,
        notes:
          `B_rms expected from the oil's protons against NV depth (proton density ${protonDensityPerNm3} nm⁻³ assumed), and the depth where ` +
          `it equals the measured ${brmsNt} ± ${brmsErrNt} nT: d = ${fixed(depthNm, 1)} ± ${fixed(depthErrNm, 1)} nm. An estimate, not a calibration.`,
        tags: { centre },
      },
    },
  };
}

/**
 * Version 2 of the PL spectrum: the same counts with the dark offset (shutter closed) subtracted,
 * a note in the header block, the column header unchanged so the panel's spec still fits.
 */
export function darkSubtractedSpectrum(v1: DemoFile, darkCounts: number): { fileName: string; content: string } {
  const lines = v1.content.split("\n");
  const headerAt = lines.findIndex((l) => l.startsWith("wavelength"));
  const out = lines.map((l, i) => {
    if (i <= headerAt || !l) return l;
    const [w, c] = l.split(",");
    return `${w},${Number(c) - darkCounts}`;
  });
  out.splice(headerAt, 0, `# dark offset: ${darkCounts} counts subtracted (30 s with the shutter closed)`);
  return { fileName: v1.fileName.replace(/\.csv$/, "_dark-subtracted.csv"), content: out.join("\n") };
}

type Part = string | { mention: string; label: string };

/** A Tiptap document of one paragraph: text and @mentions of members, as the comment editor writes it. */
export function commentDoc(...parts: Part[]): Record<string, unknown> {
  return {
    type: "doc",
    content: [
      {
        type: "paragraph",
        content: parts.map((p) => (typeof p === "string" ? { type: "text", text: p } : { type: "mention", attrs: { id: p.mention, label: p.label } })),
      },
    ],
  };
}
