import { formatCount, formatNumber } from "@/lib/data/format";
import { HEADER_UNIT_RULE } from "@/lib/data/units";
import type { VersionView } from "./api";

/** The file's header cell a column was made from; "—" for versions stored before headers were kept. */
function HeaderCell({ header, name }: { header: string | undefined; name: string }) {
  if (header === undefined)
    return (
      <span className="text-muted" title="not recorded: this version was uploaded before original headers were kept">
        —
      </span>
    );
  if (header === "")
    return (
      <span className="text-muted" title="the file has no header line; columns are numbered">
        (no header)
      </span>
    );
  return <code className={header === name ? "text-muted" : ""}>{header}</code>;
}

/** Per numeric column: the header it came from, how many values, how many missing, and their range, mean and spread. */
export function ColumnSummaryTable({ version }: { version: VersionView }) {
  const textColumns = version.columns.filter((c) => c.type !== "number");
  const headerOf = new Map(version.columns.map((c) => [c.name, c.header]));
  return (
    <div>
      <div className="relative overflow-x-auto border border-rule bg-sheet">
        <table className="w-full text-sm">
          <caption className="sr-only">Column summary of version {version.number}</caption>
          <thead className="bg-paper text-xs uppercase tracking-wide text-muted">
            <tr>
              <th scope="col" className="px-3 py-2 text-left">
                Column
              </th>
              <th scope="col" className="px-3 py-2 text-left">
                Unit
              </th>
              <th scope="col" className="px-3 py-2 text-left">
                From header
              </th>
              {["Count", "Missing", "Min", "Max", "Mean", "SD"].map((h) => (
                <th key={h} scope="col" className="px-3 py-2 text-right">
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody className="divide-y divide-rule">
            {version.summary.map((s) => (
              <tr key={s.column}>
                <th scope="row" className="px-3 py-1.5 text-left font-medium">
                  {s.column}
                </th>
                <td className="px-3 py-1.5 text-muted">{s.unit ?? "—"}</td>
                <td className="px-3 py-1.5">
                  <HeaderCell header={headerOf.get(s.column)} name={s.column} />
                </td>
                <td className="px-3 py-1.5 text-right tabular">{formatCount(s.count)}</td>
                <td className="px-3 py-1.5 text-right tabular">
                  {s.missing ? (
                    <span className="text-warn">
                      <span aria-hidden>⚠ </span>
                      {formatCount(s.missing)}
                    </span>
                  ) : (
                    "0"
                  )}
                </td>
                {[s.min, s.max, s.mean, s.sd].map((v, i) => (
                  <td key={i} className="px-3 py-1.5 text-right tabular">
                    {formatNumber(v, 5)}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {textColumns.length ? (
        <p className="mt-1 text-xs text-muted">
          Text columns, not summarised:{" "}
          {textColumns.map((c) => (c.header && c.header !== c.name ? `${c.name} (from header “${c.header}”)` : c.name)).join(", ")}.
        </p>
      ) : null}
      <p className="mt-1 text-xs text-muted" data-testid="header-unit-rule">
        {HEADER_UNIT_RULE}
      </p>
    </div>
  );
}
