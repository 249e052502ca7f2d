import type { MeasurementKind } from "@/db/schema";

const KIND_LABELS = {
  pl_map: "PL map",
  pl_spectrum: "PL spectrum",
  odmr: "ODMR",
  hahn_echo: "Hahn echo",
  decoupling: "Dynamical decoupling (CPMG, XY-N)",
  relaxation: "Relaxation (T1)",
  ramsey: "Ramsey",
  nv_nmr: "NV-NMR",
  other: "Other",
} as const satisfies Record<MeasurementKind, string>;

export const KIND_OPTIONS = Object.entries(KIND_LABELS) as Array<[MeasurementKind, string]>;

/** The order measurements usually appear in a paper, used when sorting by kind. */
export const KIND_ORDER: Record<MeasurementKind, number> = Object.fromEntries(KIND_OPTIONS.map(([k], i) => [k, i])) as Record<MeasurementKind, number>;

export function kindLabel(kind: string): string {
  return (KIND_LABELS as Record<string, string>)[kind] ?? kind;
}
