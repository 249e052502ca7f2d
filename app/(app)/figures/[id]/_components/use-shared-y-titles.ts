"use client";
import { useQueries } from "@tanstack/react-query";
import { fetchJson } from "@/components/api-client";
import { queryKeys, type FigureView, type RevisionView } from "@/components/figures/api";
import { yTitlesLeftOut } from "@/lib/figures/shared-titles";

/**
 * Per panel id, the y title to leave out of its preview when the figure shares y titles (one per
 * row, as the exports draw it): the title it repeats from the first panel of its grid row.
 * Reads the same cached revisions as the tiles do.
 */
export function useSharedYTitles(figure: FigureView): Map<string, string> {
  const revisions = useQueries({
    queries: figure.panels.map((p) => ({
      queryKey: queryKeys.revision(p.currentRevision?.id ?? ""),
      queryFn: () => fetchJson<RevisionView>(`/api/revisions/${p.currentRevision!.id}`),
      enabled: figure.shareYTitles && Boolean(p.currentRevision),
      staleTime: Infinity,
    })),
  });
  const leftOut = new Map<string, string>();
  if (!figure.shareYTitles) return leftOut;
  const titles = yTitlesLeftOut(
    figure.panels.map((p, i) => ({ span: p.colSpan, spec: revisions[i]?.data?.spec })),
    figure.columns,
  );
  figure.panels.forEach((p, i) => {
    if (titles[i] !== undefined) leftOut.set(p.id, titles[i]);
  });
  return leftOut;
}
