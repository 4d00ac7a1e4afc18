// Plain-language formatting shared by the screens.

export function ageFromSeconds(seconds: number): string {
  const minutes = Math.round(seconds / 60);
  if (minutes < 1) return "just now";
  if (minutes < 60) return `${minutes} min ago`;
  const hours = Math.round(minutes / 60);
  if (hours < 48) return `${hours} h ago`;
  return `${Math.round(hours / 24)} days ago`;
}

export const ageOf = (iso: string): string => ageFromSeconds((Date.now() - Date.parse(iso)) / 1000);

export const percent = (share: number, digits = 1): string => `${(share * 100).toFixed(digits)}%`;

/** Measures in [0,1] shown with four decimals: enough to tell neighbours apart, short enough for a column. */
export const measure = (v: number): string => v.toFixed(4);

/** What screens show for an iterative measure that did not converge: never a number. */
export const NOT_CONVERGED = "did not converge";

/** A measure that may have been withheld because its iteration did not converge. */
export const convergedMeasure = (v: number | null): string => (v === null ? NOT_CONVERGED : measure(v));

/** A competition rank with its tie shown: "=4" when others share rank 4 (1, 2, 2, 4). */
export const rankLabel = (p: { rank: number | null; tied: number }): string => (p.rank === null ? "—" : p.tied > 1 ? `=${p.rank}` : String(p.rank));

/** Betweenness as a share of shortest paths, two decimals everywhere so "0.41%" and "0.00%" line up across screens. */
export const betweennessPct = (v: number): string => `${(v * 100).toFixed(2)}%`;

/** Pinch score (0–100) always with one decimal, the same on every screen. */
export const pinchScore = (v: number): string => v.toFixed(1);

export const plural = (n: number, one: string, many = `${one}s`): string => `${n} ${n === 1 ? one : many}`;

/** Every time on every screen: UTC, to the minute (or second), so people in different zones quote the same string (components/ui/When.tsx shows it with its age). */
export function dateTime(iso: string | Date, { seconds = false }: { seconds?: boolean } = {}): string {
  const s = (iso instanceof Date ? iso : new Date(iso)).toISOString();
  return `${s.slice(0, 10)} ${s.slice(11, seconds ? 19 : 16)} UTC`;
}

/** A calendar day as the API writes it (YYYY-MM-DD), or the UTC day of an instant: written the same way as dateTime's date. */
export const day = (value: string): string => value.slice(0, 10);

/** Only http(s) and mailto links become clickable: an inventory file must not inject javascript: URLs. */
export function safeHref(url: string): string | null {
  try {
    const u = new URL(url);
    return ["http:", "https:", "mailto:"].includes(u.protocol) ? u.toString() : null;
  } catch {
    return null;
  }
}

/** "12/min · 3% errors": calls per minute, and the error rate when there are errors. */
export function trafficLine(t: { callsPerMinute: number; errorRate: number }): string {
  const rate = t.callsPerMinute >= 10 ? Math.round(t.callsPerMinute).toLocaleString() : t.callsPerMinute >= 0.1 ? t.callsPerMinute.toFixed(1) : "<0.1";
  return `${rate}/min${t.errorRate > 0 ? ` · ${t.errorRate < 0.001 ? "<0.1" : (t.errorRate * 100).toFixed(t.errorRate < 0.1 ? 1 : 0)}% errors` : ""}`;
}
