"use client";
import { useQuery } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { fetchJson } from "@/components/api-client";
import { FigureList, type FigureListItem } from "@/components/figures/figure-list";
import { EmptyState } from "@/components/ui";
import { ArchiveToggleButton, ShowArchivedToggle } from "./archive-controls";

/** The manuscript's figures with an Archive action each, and "Show archived" to list (and restore) the archived ones. */
export function ArchivableFigureList({ manuscriptId, figures, mayArchive }: { manuscriptId: string; figures: FigureListItem[]; mayArchive: boolean }) {
  const router = useRouter();
  const [showArchived, setShowArchived] = useState(false);
  const archived = useQuery({
    queryKey: ["figures", manuscriptId, "archived"],
    enabled: showArchived,
    queryFn: () => fetchJson<{ items: FigureListItem[] }>(`/api/manuscripts/${manuscriptId}/figures?archived=1`).then((r) => r.items),
  });
  const shown = showArchived ? (archived.data ?? []) : figures;
  const done = () => {
    void archived.refetch();
    router.refresh();
  };
  return (
    <div>
      <p className="mb-2">
        <ShowArchivedToggle checked={showArchived} onChange={setShowArchived} />
      </p>
      {shown.length ? (
        <FigureList
          figures={shown}
          actions={mayArchive ? (f) => <ArchiveToggleButton kind="figure" id={f.id} archived={showArchived} onDone={done} /> : undefined}
        />
      ) : showArchived ? (
        <EmptyState title="No archived figures" />
      ) : (
        <EmptyState title="No figures yet">Figures and their panels appear here, each with its review state.</EmptyState>
      )}
    </div>
  );
}
