/** Shape of one invented demo measurement file (see lib/demo-data/index.ts). */

type DemoKind = "pl_map" | "pl_spectrum" | "odmr" | "hahn_echo" | "relaxation" | "ramsey" | "nv_nmr" | "decoupling" | "other";

export interface DemoFile {
  /** File name as uploaded, e.g. "echo_K17-NV03.csv". */
  fileName: string;
  /** Dataset name shown in the UI, e.g. "Hahn echo, NV03 (sample K17)". */
  name: string;
  kind: DemoKind;
  sample: string;
  instrument: string;
  /** ISO 8601 date-time (UTC). */
  measuredAt: string;
  /** Free text; for generated curves it states the true parameters used. */
  notes: string;
  /** e.g. { group: "as-grown", centre: "NV03" }. */
  tags: Record<string, string>;
  /** The file text exactly as the instrument software would write it. */
  content: string;
}
