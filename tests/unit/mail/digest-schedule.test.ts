// When a digest falls due: the person's hour, on a digest day, in their own time zone. Expected
// instants are worked out by hand from the zone rules (Berlin: UTC+1 in winter, UTC+2 from the last
// Sunday of March to the last Sunday of October; New York: UTC−5 / UTC−4 from the second Sunday of March).
import { describe, expect, it } from "vitest";
import { isTimeZone, latestDigestSlot, previousDigestSlot, type DigestSchedule } from "@/lib/server/mail/digest-schedule";

const berlin: DigestSchedule = { frequency: "daily", hour: 8, timeZone: "Europe/Berlin" };
const iso = (d: Date | null) => d?.toISOString() ?? null;

describe("latestDigestSlot", () => {
  it("08:00 in Berlin on a Monday in winter is 07:00 UTC", () => {
    expect(iso(latestDigestSlot(berlin, new Date("2026-01-05T07:00:00Z")))).toBe("2026-01-05T07:00:00.000Z");
  });
  it("08:00 in Berlin on a Monday in summer is 06:00 UTC", () => {
    expect(iso(latestDigestSlot(berlin, new Date("2026-07-06T06:00:00Z")))).toBe("2026-07-06T06:00:00.000Z");
  });
  it("a minute before the hour, the last digest due is Friday's", () => {
    expect(iso(latestDigestSlot(berlin, new Date("2026-01-05T06:59:00Z")))).toBe("2026-01-02T07:00:00.000Z");
  });
  it("a daily digest skips the weekend", () => {
    expect(iso(latestDigestSlot(berlin, new Date("2026-01-10T12:00:00Z")))).toBe("2026-01-09T07:00:00.000Z");
    expect(iso(latestDigestSlot(berlin, new Date("2026-01-11T23:30:00Z")))).toBe("2026-01-09T07:00:00.000Z");
  });
  it("the Monday after the spring change is 06:00 UTC, the Friday before 07:00 UTC", () => {
    const monday = latestDigestSlot(berlin, new Date("2026-03-30T09:00:00Z"));
    expect(iso(monday)).toBe("2026-03-30T06:00:00.000Z");
    expect(iso(previousDigestSlot(berlin, monday!))).toBe("2026-03-27T07:00:00.000Z");
  });
  it("a weekly digest is on Mondays", () => {
    const weekly: DigestSchedule = { frequency: "weekly", hour: 8, timeZone: "Europe/Berlin" };
    expect(iso(latestDigestSlot(weekly, new Date("2026-01-09T12:00:00Z")))).toBe("2026-01-05T07:00:00.000Z");
    expect(iso(previousDigestSlot(weekly, new Date("2026-01-05T07:00:00Z")))).toBe("2025-12-29T07:00:00.000Z");
  });
  it("the local date decides the day: 18:00 Friday in New York is Saturday in UTC", () => {
    const ny: DigestSchedule = { frequency: "daily", hour: 18, timeZone: "America/New_York" };
    expect(iso(latestDigestSlot(ny, new Date("2026-01-10T03:00:00Z")))).toBe("2026-01-09T23:00:00.000Z");
    expect(iso(latestDigestSlot(ny, new Date("2026-03-09T23:00:00Z")))).toBe("2026-03-09T22:00:00.000Z");
  });
  it("an hour the clock skips lands just after the jump", () => {
    // Cairo moves from UTC+2 to UTC+3 at midnight starting Friday 24 April 2026: 00:00 never shows, 01:00 is 22:00 UTC.
    const cairo: DigestSchedule = { frequency: "daily", hour: 0, timeZone: "Africa/Cairo" };
    expect(iso(latestDigestSlot(cairo, new Date("2026-04-24T12:00:00Z")))).toBe("2026-04-23T22:00:00.000Z");
    expect(iso(latestDigestSlot(cairo, new Date("2026-04-28T12:00:00Z")))).toBe("2026-04-27T21:00:00.000Z");
  });
  it("off means never", () => {
    expect(latestDigestSlot({ ...berlin, frequency: "off" }, new Date("2026-01-05T12:00:00Z"))).toBeNull();
  });
  it("knows IANA names", () => {
    expect(isTimeZone("Europe/Berlin")).toBe(true);
    expect(isTimeZone("Mars/Olympus_Mons")).toBe(false);
  });
});
