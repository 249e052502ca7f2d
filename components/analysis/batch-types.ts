import type { Column } from "./fit-options";

/** A source dataset's current version, as the batch page needs it. */
export interface BatchDataset {
  id: string;
  name: string;
  kind: string;
  sample: string | null;
  instrument: string | null;
  tags: Record<string, string>;
  versionId: string;
  versionNumber: number;
  columns: Column[];
}
