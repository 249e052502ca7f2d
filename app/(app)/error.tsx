"use client";
import { ErrorPanel } from "@/components/error-panel";

/** Errors in a signed-in page: shown under the main navigation, which stays usable. */
export default function AppError({ error, retry }: { error: unknown; retry: () => void }) {
  return <ErrorPanel error={error} retry={retry} className="py-16" />;
}
