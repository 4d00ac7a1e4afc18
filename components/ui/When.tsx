// Every date and time on every screen: absolute, in UTC (people in different zones quote the same
// string), with how long ago in the tooltip. A calendar day (a review-by date) has no time.
import { ageOf, dateTime } from "./format";

export function When({ at, seconds = false, empty = "—" }: { at: string | Date | null | undefined; seconds?: boolean; empty?: string }) {
  if (!at) return <span className="text-faint">{empty}</span>;
  const iso = at instanceof Date ? at.toISOString() : at;
  return (
    // The age differs between the server's render and the browser's by the time in between.
    <time dateTime={iso} title={ageOf(iso)} suppressHydrationWarning className="whitespace-nowrap">
      {dateTime(iso, { seconds })}
    </time>
  );
}
