// Calendar weeks for the weekly digest (its heading and its once-a-week dedupe key).

/**
 * ISO 8601 week of a date (UTC), as `YYYY-Www`: weeks start on Monday, and week 1 is the one with
 * the year's first Thursday, so the week-numbering year can differ from the calendar year.
 */
export function isoWeek(date: Date): string {
  const day = new Date(Date.UTC(date.getUTCFullYear(), date.getUTCMonth(), date.getUTCDate()));
  const weekday = day.getUTCDay() || 7;
  // The Thursday of this week decides the year.
  day.setUTCDate(day.getUTCDate() + 4 - weekday);
  const yearStart = Date.UTC(day.getUTCFullYear(), 0, 1);
  const week = Math.ceil(((day.getTime() - yearStart) / 86_400_000 + 1) / 7);
  return `${day.getUTCFullYear()}-W${String(week).padStart(2, "0")}`;
}
