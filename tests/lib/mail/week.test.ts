// ISO 8601 week dates, checked against Python's datetime.date.isocalendar (Debian's python3, run in
// the test) over three years of days around the year boundaries where the two calendars differ.
import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { isoWeek } from "@/lib/mail/week";
import { PYTHON } from "../../analysis/python";

describe("isoWeek", () => {
  it("agrees with Python's isocalendar() on every day from 2026-12-20 to 2029-12-31", () => {
    const start = Date.UTC(2026, 11, 20);
    const days = Array.from({ length: 1108 }, (_, i) => new Date(start + i * 86_400_000).toISOString().slice(0, 10));
    const script = `import sys, json, datetime
days = json.loads(sys.argv[1])
print(json.dumps(["%d-W%02d" % datetime.date.fromisoformat(d).isocalendar()[:2] for d in days]))`;
    const expected = JSON.parse(execFileSync(PYTHON, ["-c", script, JSON.stringify(days)], { encoding: "utf8" })) as string[];
    // Any time of the day gives the same week (the week is the UTC day's).
    expect(days.map((d, i) => isoWeek(new Date(`${d}T${i % 2 ? "23:59:59" : "00:00:00"}Z`)))).toEqual(expected);
    // Where the calendars part: 2027-01-01 is a Friday, still week 53 of 2026 (checked with isocalendar above).
    expect(isoWeek(new Date("2027-01-01T12:00:00Z"))).toBe("2026-W53");
  });
});
