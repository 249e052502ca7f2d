"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { formatDate } from "@/lib/data/format";
import { ArchiveToggleButton, ShowArchivedToggle } from "./archive-controls";

/** The figure's archived panels behind "Show archived": each opens its page (its trail intact) or is restored into the figure. */
export function ArchivedPanels({
  panels,
  canRestore,
}: {
  panels: Array<{ id: string; title: string; archivedAt: string | Date | null }>;
  canRestore: boolean;
}) {
  const router = useRouter();
  const [shown, setShown] = useState(false);
  if (!panels.length) return null;
  return (
    <section aria-label="Archived panels" className="mt-6 text-sm print:hidden">
      <ShowArchivedToggle checked={shown} onChange={setShown} />
      <span className="ml-2 text-xs text-muted">
        {panels.length} archived panel{panels.length === 1 ? "" : "s"}
      </span>
      {shown ? (
        <ul className="mt-2 space-y-1">
          {panels.map((p) => (
            <li key={p.id} className="flex flex-wrap items-center gap-2">
              <span aria-hidden>▣</span>
              <Link href={`/panels/${p.id}`} className="underline">
                {p.title || "Untitled panel"}
              </Link>
              <span className="text-xs text-muted">archived {formatDate(p.archivedAt)}</span>
              {canRestore ? <ArchiveToggleButton kind="panel" id={p.id} archived onDone={() => router.refresh()} /> : null}
            </li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}
