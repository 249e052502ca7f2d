import { formatDate, relativeTime } from "@/lib/data/format";

/** Relative for reading at a glance, absolute (UTC) on hover and for machines. */
export function RelativeTime({ at, className = "" }: { at: Date | string | number; className?: string }) {
  const iso = new Date(at).toISOString();
  return (
    <time dateTime={iso} title={formatDate(at)} className={`whitespace-nowrap ${className}`} suppressHydrationWarning>
      {relativeTime(at)}
    </time>
  );
}
