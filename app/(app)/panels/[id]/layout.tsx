import type { ReactNode } from "react";
import { requireReadableOrNotFound } from "@/lib/http/session";
import { manuscriptOfPanel } from "@/lib/server/figures/scope";

/** Access is checked here, above loading.tsx, so a panel this person may not open is a real 404 (see ../not-found.tsx). */
export default async function PanelLayout({ children, params }: { children: ReactNode; params: Promise<{ id: string }> }) {
  const { id } = await params;
  await requireReadableOrNotFound(() => manuscriptOfPanel(id));
  return children;
}
