import Link from "next/link";
import { Fragment } from "react";
import { formatBytes, formatCount, formatDate, shortHash } from "@/lib/data/format";
import type { DatasetDetail } from "./api";
import { CopyButton } from "./copy-button";

type Version = DatasetDetail["versions"][number];

function Warnings({ warnings }: { warnings: string[] }) {
  return (
    <div className="text-xs text-warn">
      <p className="font-medium">
        <span aria-hidden>⚠ </span>
        {warnings.length} parse warning{warnings.length === 1 ? "" : "s"}
      </p>
      <ul className="mt-0.5 list-disc space-y-0.5 pl-5">
        {warnings.map((w, i) => (
          <li key={i}>{w}</li>
        ))}
      </ul>
    </div>
  );
}

/** Every stored version, newest first; each names its bytes by SHA-256 and offers them back unchanged. */
export function VersionsTable({ datasetId, versions, selectedId }: { datasetId: string; versions: Version[]; selectedId: string | undefined }) {
  return (
    <div className="relative overflow-x-auto border border-rule bg-sheet">
      <table className="w-full text-sm">
        <caption className="sr-only">Versions of this dataset, newest first</caption>
        <thead className="bg-paper text-left text-xs uppercase tracking-wide text-muted">
          <tr>
            <th scope="col" className="px-3 py-2">
              Version
            </th>
            <th scope="col" className="px-3 py-2">
              SHA-256
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              Size
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              Rows
            </th>
            <th scope="col" className="px-3 py-2">
              Uploaded
            </th>
            <th scope="col" className="px-3 py-2">
              <span className="sr-only">Download</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {versions.map((v) => {
            const selected = v.id === selectedId;
            return (
              <Fragment key={v.id}>
                <tr className={`border-t border-rule align-top ${selected ? "bg-accent-soft/60" : ""}`} data-testid="version-row">
                  <td className="whitespace-nowrap px-3 py-2">
                    {selected ? (
                      <span aria-current="true" className="font-semibold">
                        <span aria-hidden>▸ </span>v{v.number} <span className="text-xs font-normal text-muted">shown below</span>
                      </span>
                    ) : (
                      <Link href={`/datasets/${datasetId}?v=${v.id}`} className="text-accent underline" aria-label={`Show version ${v.number}`}>
                        v{v.number}
                      </Link>
                    )}
                  </td>
                  <td className="px-3 py-2">
                    <span className="inline-flex items-center gap-1.5">
                      <code className="font-mono text-xs" title={v.sha256} data-testid="version-sha">
                        {shortHash(v.sha256, 8)}
                      </code>
                      <CopyButton value={v.sha256} label={`Copy the SHA-256 of version ${v.number}`} />
                    </span>
                    <span className="mt-0.5 block max-w-[14rem] truncate text-xs text-muted" title={v.fileName}>
                      {v.fileName}
                    </span>
                  </td>
                  <td className="whitespace-nowrap px-3 py-2 text-right tabular">{formatBytes(v.byteSize)}</td>
                  <td className="whitespace-nowrap px-3 py-2 text-right tabular">{formatCount(v.rowCount)}</td>
                  <td className="px-3 py-2">
                    <span className="block">{v.createdByName}</span>
                    <span className="block whitespace-nowrap text-xs text-muted">{formatDate(v.createdAt)}</span>
                  </td>
                  <td className="whitespace-nowrap px-3 py-2 text-right">
                    <a href={`/api/versions/${v.id}/raw`} download className="text-accent underline" aria-label={`Download original of version ${v.number}`}>
                      Download original
                    </a>
                  </td>
                </tr>
                {v.warnings.length ? (
                  <tr className={selected ? "bg-accent-soft/60" : ""}>
                    <td colSpan={6} className="px-3 pb-2 pt-0">
                      <Warnings warnings={v.warnings} />
                    </td>
                  </tr>
                ) : null}
              </Fragment>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
