"use client";
import { ErrorPanel } from "@/components/error-panel";

/** Errors outside the signed-in area (sign-in, invitations, the outbox) and in the app layout itself. */
export default function RootError({ error, retry }: { error: unknown; retry: () => void }) {
  return (
    <main className="px-6 py-24">
      <ErrorPanel error={error} retry={retry} />
    </main>
  );
}
