import Link from "next/link";
import type { ReactNode } from "react";

/**
 * What a route segment shows while its page loads (loading.tsx): the words say what is coming and
 * a ◌ marks it as in progress; the grey shapes only hint at the layout, so nothing rests on colour.
 */
export function PageSkeleton({ what, layout = "single" }: { what: string; layout?: "single" | "with-aside" }) {
  const bar = "animate-pulse rounded-sm bg-paper";
  const block = (height: string) => (
    <div className={`rounded-sm border border-rule bg-sheet p-5 ${height}`}>
      <div className={`h-4 w-1/3 ${bar}`} />
      <div className={`mt-3 h-3 w-2/3 ${bar}`} />
      <div className={`mt-2 h-3 w-1/2 ${bar}`} />
    </div>
  );
  return (
    <div role="status" aria-busy="true" data-testid="page-loading">
      <div className="mb-6 border-b border-rule pb-4">
        <p className="text-sm text-muted">
          <span aria-hidden>◌ </span>Loading {what}…
        </p>
        <div aria-hidden className="mt-2 h-7 w-2/5 animate-pulse rounded-sm bg-sheet" />
      </div>
      <div aria-hidden className={layout === "with-aside" ? "grid gap-6 lg:grid-cols-[1fr_280px]" : "grid gap-6"}>
        {block("h-72")}
        {layout === "with-aside" ? block("h-48") : block("h-32")}
      </div>
    </div>
  );
}

/**
 * A segment's notFound(): the address names nothing this person may open. The wording keeps
 * "Nothing here" (as the site-wide page does) and says what was looked for and where to go next.
 */
export function SegmentNotFound({ what, children }: { what: string; children?: ReactNode }) {
  return (
    <div className="mx-auto max-w-lg py-16 text-center">
      <p className="text-5xl font-semibold text-muted">404</p>
      <h1 className="mt-4 text-xl font-semibold">Nothing here</h1>
      <p className="mt-2 text-sm text-muted">
        No {what} has this address, or it belongs to a manuscript you are not a member of.
        {children ? <> {children}</> : null}
      </p>
      <Link href="/manuscripts" className="mt-6 inline-block text-accent underline">
        Your manuscripts
      </Link>
    </div>
  );
}
