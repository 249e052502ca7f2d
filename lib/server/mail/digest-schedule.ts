import "server-only";
import type { DigestFrequency } from "@/db/schema";

export interface DigestSchedule {
  frequency: DigestFrequency;
  /** Local hour, 0–23. */
  hour: number;
  /** IANA time zone, e.g. "Europe/Berlin". */
  timeZone: string;
}

/** The schedule of someone who has not chosen: weekdays at 08:00, UTC until they pick a zone. */
export const DEFAULT_DIGEST_SCHEDULE: DigestSchedule = { frequency: "daily", hour: 8, timeZone: "UTC" };

const DAY_MS = 24 * 60 * 60 * 1000;
/** Daily digests go out Monday to Friday, weekly ones on Monday (0 = Sunday). */
const DIGEST_WEEKDAYS: Record<Exclude<DigestFrequency, "off">, readonly number[]> = { daily: [1, 2, 3, 4, 5], weekly: [1] };

const formatters = new Map<string, Intl.DateTimeFormat>();
function partsIn(timeZone: string, t: number) {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", {
      timeZone,
      hourCycle: "h23",
      year: "numeric",
      month: "numeric",
      day: "numeric",
      hour: "numeric",
      minute: "numeric",
      second: "numeric",
    });
    formatters.set(timeZone, f);
  }
  const p = Object.fromEntries(f.formatToParts(t).map((x) => [x.type, x.value]));
  return { y: Number(p.year), m: Number(p.month), d: Number(p.day), h: Number(p.hour), min: Number(p.minute), s: Number(p.second) };
}

/** Local time minus UTC at instant `t`, in milliseconds (Berlin in winter: +3 600 000). */
function offsetAt(timeZone: string, t: number): number {
  const p = partsIn(timeZone, t);
  return Date.UTC(p.y, p.m - 1, p.d, p.h, p.min, p.s) - Math.floor(t / 1000) * 1000;
}

/** The instant at which the wall clock in `timeZone` shows `hour`:00 on the given local date (a skipped hour lands just after the jump). */
function localHourToInstant(timeZone: string, y: number, m: number, d: number, hour: number): number {
  const wall = Date.UTC(y, m - 1, d, hour);
  const first = wall - offsetAt(timeZone, wall);
  const second = wall - offsetAt(timeZone, first);
  return second === first ? first : Math.max(first, second);
}

/** True when `timeZone` is an IANA name this runtime knows. */
export function isTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat("en-US", { timeZone });
    return true;
  } catch {
    return false;
  }
}

/**
 * The latest moment at or before `now` when this person's digest falls due (their hour, on a
 * digest day, in their time zone), or null when digests are off. A digest belongs to this moment:
 * it covers the activity up to it, and (user, moment) is its unique key.
 */
export function latestDigestSlot(s: DigestSchedule, now: Date): Date | null {
  if (s.frequency === "off") return null;
  const days = DIGEST_WEEKDAYS[s.frequency];
  const today = partsIn(s.timeZone, now.getTime());
  for (let back = 0; back <= 8; back++) {
    const local = new Date(Date.UTC(today.y, today.m - 1, today.d) - back * DAY_MS);
    if (!days.includes(local.getUTCDay())) continue;
    const at = localHourToInstant(s.timeZone, local.getUTCFullYear(), local.getUTCMonth() + 1, local.getUTCDate(), s.hour);
    if (at <= now.getTime()) return new Date(at);
  }
  return null;
}

/** The digest moment before `slot` (Friday's for a weekday digest due on Monday). */
export function previousDigestSlot(s: DigestSchedule, slot: Date): Date | null {
  return latestDigestSlot(s, new Date(slot.getTime() - 1));
}
