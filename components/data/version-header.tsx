import type { VersionView } from "./api";

/** Which version the plot, summary and rows below belong to, and how its file was read. */
export function VersionHeader({ version, latest }: { version: VersionView; latest: boolean }) {
  const p = version.parse;
  const delimiter = p.delimiter === "\t" ? "tab" : p.delimiter === " " ? "space" : p.delimiter;
  const header = Object.entries(p.headerMetadata ?? {});
  return (
    <div>
      <h2 id="version-heading" className="text-lg font-semibold">
        Version {version.number} <span className="text-sm font-normal text-muted">{latest ? "(latest)" : "(an earlier version)"}</span>
      </h2>
      <p className="text-xs text-muted">
        {version.fileName} · read as {p.format}
        {delimiter ? `, delimiter “${delimiter}”` : ""}, decimal “{p.decimal}”, {p.encoding}
      </p>
      {header.length ? (
        <details className="mt-1 text-xs">
          <summary className="cursor-pointer text-muted">
            File header ({header.length} entr{header.length === 1 ? "y" : "ies"})
          </summary>
          <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 rounded-sm border border-rule bg-sheet p-2">
            {header.map(([k, val]) => (
              <div key={k} className="contents">
                <dt className="text-muted">{k}</dt>
                <dd className="break-words">{val}</dd>
              </div>
            ))}
          </dl>
        </details>
      ) : null}
    </div>
  );
}
