import type { ReactNode } from "react";
import { requireReadableOrNotFound } from "@/lib/http/session";

/** Access is checked here, above loading.tsx, so a manuscript this person may not open is a real 404 (see ../not-found.tsx). */
export default async function ManuscriptLayout({ children, params }: { children: ReactNode; params: Promise<{ id: string }> }) {
  const { id } = await params;
  await requireReadableOrNotFound(() => Promise.resolve(id));
  return children;
}
