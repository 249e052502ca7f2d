/**
 * Invented demo measurement files for Prooflight, generated from the published models with
 * seeded noise (no database, no file system). Scenario: the Kestrel Spin Sensing Group's
 * ¹²C-enriched diamond plate K17 in three groups (as-grown, annealed-1200C,
 * oxygen-terminated), measured in 2026 on confocal setup A and spectrometer S2.
 * Deterministic: every file has its own fixed seed, so two calls give identical bytes.
 */
import type { DemoFile } from "./types";
import { plMapFiles } from "./pl-map";
import { plSpectrumFiles } from "./pl-spectrum";
import { odmrFiles } from "./odmr";
import { hahnEchoFiles } from "./hahn-echo";
import { decouplingFiles } from "./decoupling";
import { relaxationFiles } from "./relaxation";
import { ramseyFiles } from "./ramsey";
import { nvNmrFiles } from "./nv-nmr";
import { calibrationFiles } from "./calibration";

export type { DemoFile } from "./types";

export function demoFiles(): DemoFile[] {
  return [
    ...plMapFiles(),
    ...plSpectrumFiles(),
    ...odmrFiles(),
    ...hahnEchoFiles(),
    ...decouplingFiles(),
    ...relaxationFiles(),
    ...ramseyFiles(),
    ...nvNmrFiles(),
    ...calibrationFiles(),
  ];
}
