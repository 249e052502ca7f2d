import { formatDate } from "@/components/ui";

const UNITS: Array<[Intl.RelativeTimeFormatUnit, number]> = [
  ["year", 365 * 86_400_000], ["month", 30 * 86_400_000], ["week", 7 * 86_400_000],
  ["day", 86_400_000], ["hour", 3_600_000], ["minute", 60_000],
];
const rtf = new Intl.RelativeTimeFormat("en", { numeric: "auto" });

/** "3 hours ago" against `now` (ms); under a minute is "just now". */
export function relativeTime(at: Date | string | number, now = Date.now()): string {
  const diff = new Date(at).getTime() - now;
  for (const [unit, ms] of UNITS) {
    if (Math.abs(diff) >= ms) return rtf.format(Math.round(diff / ms), unit);
  }
  return "just now";
}

/** Relative for reading at a glance, absolute (UTC) on hover and for machines. */
export function RelativeTime({ at, className = "" }: { at: Date | string | number; className?: string }) {
  const iso = new Date(at).toISOString();
  return (
    <time dateTime={iso} title={formatDate(at)} className={`whitespace-nowrap ${className}`} suppressHydrationWarning>
      {relativeTime(at)}
    </time>
  );
}
