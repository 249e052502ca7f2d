"use client";
import Link from "next/link";
import { Button } from "@/components/ui";

/**
 * The fallback of an error.tsx boundary: a calm sentence, Try again (re-fetches and re-renders the
 * segment) and a way out. The error's message and stack are never shown — server errors reach the
 * browser without them anyway; the digest names the server log entry.
 */
export function ErrorPanel({ error, retry, className = "" }: { error: unknown; retry: () => void; className?: string }) {
  const digest = error instanceof Error && "digest" in error && typeof error.digest === "string" ? error.digest : null;
  return (
    <div role="alert" className={`mx-auto max-w-lg text-center ${className}`}>
      <p aria-hidden className="text-4xl text-warn">
        △
      </p>
      <h1 className="mt-3 text-xl font-semibold">This page could not be shown</h1>
      <p className="mt-2 text-sm text-muted">
        Something went wrong while preparing it. What you have already saved is not affected. Try again, or go back to your manuscripts.
      </p>
      <div className="mt-6 flex items-center justify-center gap-4">
        <Button type="button" onClick={() => retry()}>
          Try again
        </Button>
        <Link href="/manuscripts" className="text-sm text-accent underline">
          Your manuscripts
        </Link>
      </div>
      {digest ? (
        <p className="mt-6 text-xs text-muted">
          If it keeps happening, quote reference <code>{digest}</code>.
        </p>
      ) : null}
    </div>
  );
}
