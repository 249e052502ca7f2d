/**
 * The invented demo scenario (no real people, labs or institutions): the Kestrel Spin Sensing
 * Group studies shallow NV centres in the ¹²C-enriched diamond plate "K17", split into three
 * sample groups, measured in 2026 on "confocal setup A" and "spectrometer S2".
 */

export const LAB = "Kestrel Spin Sensing Group";
export const SAMPLE = "K17";
export const CONFOCAL = "confocal setup A";
export const SPECTROMETER = "spectrometer S2";

export type SampleGroup = "as-grown" | "annealed-1200C" | "oxygen-terminated";

export const GROUPS: readonly SampleGroup[] = ["as-grown", "annealed-1200C", "oxygen-terminated"];

/** Which sample piece each group is; the centre numbering runs on across the groups. */
const GROUP_DESCRIPTION: Readonly<Record<SampleGroup, string>> = {
  "as-grown": "as grown after implantation",
  "annealed-1200C": "annealed 2 h at 1200 °C in vacuum",
  "oxygen-terminated": "annealed, then oxygen-terminated (tri-acid clean + oxygen anneal)",
};

/** Centre label NV01 … NV12: four centres per group, numbered across the groups. */
export function centreLabel(groupIndex: number, k: number): string {
  return `NV${String(groupIndex * 4 + k + 1).padStart(2, "0")}`;
}

/** ISO 8601 date-time (UTC) in 2026. */
export function measuredAt(month: number, day: number, hour: number, minute: number): string {
  const pad = (n: number) => String(n).padStart(2, "0");
  return `2026-${pad(month)}-${pad(day)}T${pad(hour)}:${pad(minute)}:00Z`;
}

/** `# key: value` header lines (the same convention for every text file of setup A and S2). */
export function commentHeader(pairs: Array<[string, string]>): string {
  return pairs.map(([k, v]) => `# ${k}: ${v}\n`).join("");
}

/** Header lines common to every file: lab, instrument, sample, group, time. */
export function standardHeader(instrument: string, group: SampleGroup | null, when: string): Array<[string, string]> {
  const pairs: Array<[string, string]> = [
    ["lab", LAB],
    ["instrument", instrument],
    ["sample", SAMPLE],
  ];
  if (group) pairs.push(["group", `${group} (${GROUP_DESCRIPTION[group]})`]);
  pairs.push(["measured", when]);
  return pairs;
}
