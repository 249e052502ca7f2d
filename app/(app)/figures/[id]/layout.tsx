import type { ReactNode } from "react";
import { requireReadableOrNotFound } from "@/lib/http/session";
import { manuscriptOfFigure } from "@/lib/server/figures/scope";

/** Access is checked here, above loading.tsx, so a figure this person may not open is a real 404 (see ../not-found.tsx). */
export default async function FigureLayout({ children, params }: { children: ReactNode; params: Promise<{ id: string }> }) {
  const { id } = await params;
  await requireReadableOrNotFound(() => manuscriptOfFigure(id));
  return children;
}
