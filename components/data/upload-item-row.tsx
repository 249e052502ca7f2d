"use client";
import Link from "next/link";
import { formatBytes, formatCount, shortHash } from "@/lib/data/format";
import type { UploadItem } from "./use-upload-queue";

function percent(it: UploadItem): number {
  if (it.status === "stored" || it.status === "checking") return 100;
  return it.total > 0 ? Math.min(100, Math.round((it.loaded / it.total) * 100)) : 0;
}

function StatusLine({ it }: { it: UploadItem }) {
  switch (it.status) {
    case "queued":
      return (
        <span className="text-muted">
          <span aria-hidden>○ </span>waiting to send
        </span>
      );
    case "sending":
      return (
        <span>
          <span aria-hidden>◔ </span>sending · {percent(it)} %
        </span>
      );
    case "checking":
      return (
        <span>
          <span aria-hidden>◑ </span>sent · checking and storing the file…
        </span>
      );
    case "cancelled":
      return (
        <span className="text-muted">
          <span aria-hidden>– </span>
          {it.error}
        </span>
      );
    case "failed":
      return (
        <span className="text-bad">
          <span aria-hidden className="font-bold">
            ✕{" "}
          </span>
          {it.error}
        </span>
      );
    case "stored": {
      const v = it.version!;
      return (
        <span className="text-good">
          <span aria-hidden className="font-bold">
            ✓{" "}
          </span>
          {v.deduplicated ? "identical to the latest version; kept as version" : "stored as version"} {v.number} · sha256{" "}
          <span title={v.sha256} className="font-mono">
            {shortHash(v.sha256, 8)}
          </span>{" "}
          · {formatCount(v.rowCount)} row{v.rowCount === 1 ? "" : "s"}
          {" · "}
          <Link href={`/datasets/${v.datasetId}`} className="text-accent underline">
            open dataset
          </Link>
        </span>
      );
    }
  }
}

/** One file of a batch: its bar, what is happening, and the server's answer when it comes. */
export function UploadItemRow({ item, onCancel }: { item: UploadItem; onCancel: () => void }) {
  const active = item.status === "queued" || item.status === "sending" || item.status === "checking";
  const finishedBadly = item.status === "failed" || item.status === "cancelled";
  return (
    <li className="py-2.5" data-testid="upload-item" data-status={item.status}>
      <div className="flex flex-wrap items-center gap-x-3 gap-y-1 text-sm">
        <span className="min-w-0 flex-1 truncate font-medium" title={item.fileName}>
          {item.fileName}
        </span>
        <span className="text-xs text-muted">{formatBytes(item.byteSize)}</span>
        {active ? (
          <button
            type="button"
            onClick={onCancel}
            className="rounded-sm border border-rule px-2 py-0.5 text-xs hover:bg-paper"
            aria-label={`Cancel upload of ${item.fileName}`}
          >
            Cancel
          </button>
        ) : null}
      </div>
      {finishedBadly ? null : (
        <div
          role="progressbar"
          aria-label={`Upload of ${item.fileName}`}
          aria-valuemin={0}
          aria-valuemax={100}
          aria-valuenow={percent(item)}
          className="mt-1.5 h-1.5 w-full overflow-hidden rounded-full border border-rule bg-paper"
        >
          <div className={`h-full ${item.status === "stored" ? "bg-good" : "bg-accent"} transition-[width]`} style={{ width: `${percent(item)}%` }} />
        </div>
      )}
      <p className="mt-1 break-words text-xs" aria-live="polite">
        <StatusLine it={item} />
      </p>
    </li>
  );
}
