import { EmptyState } from "@/components/ui";
import type { BatchDataset } from "./batch-types";
import { kindWords } from "./model-and-columns";

interface Props {
  legend: string;
  kind: string;
  /** The datasets of this kind, in the order shown. */
  datasets: BatchDataset[];
  ticked: (id: string) => boolean;
  onToggle: (id: string, on: boolean) => void;
  disabled?: boolean;
}

/** The datasets of one kind as a list of checkboxes (current version and group beside each name), or why there are none. */
export function DatasetChecklist({ legend, kind, datasets, ticked, onToggle, disabled }: Props) {
  if (!datasets.length) {
    return <EmptyState title={`No ${kindWords(kind)} datasets`}>Upload measurements of this kind, or choose another kind.</EmptyState>;
  }
  return (
    <fieldset className="rounded-sm border border-rule">
      <legend className="ml-3 px-1 text-sm font-semibold">{legend}</legend>
      <ul className="grid gap-x-6 gap-y-1 px-3 py-2 text-sm sm:grid-cols-2">
        {datasets.map((d) => (
          <li key={d.id}>
            <label className="flex items-baseline gap-2">
              <input type="checkbox" checked={ticked(d.id)} disabled={disabled} onChange={(e) => onToggle(d.id, e.target.checked)} />
              <span>
                {d.name}{" "}
                <span className="text-xs text-muted">
                  v{d.versionNumber}
                  {d.tags.group ? ` · ${d.tags.group}` : ""}
                </span>
              </span>
            </label>
          </li>
        ))}
      </ul>
    </fieldset>
  );
}
