// Cross-site request forgery: a signed-in browser sends its session cookie with any request a
// page on the same site makes (another port of this host, a sibling subdomain), so a write that
// rides on the cookie must prove it was made by one of our own pages. Browsers attach
// Sec-Fetch-Site and Origin to every such request and no page can forge either; clients with an
// API token send no ambient credential and need no such proof.
import { appUrl } from "@/lib/config";
import { AppError } from "@/lib/errors";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export const isWriteMethod = (method: string): boolean => !SAFE_METHODS.has(method.toUpperCase());

/** The app's own origin, from NEXTAUTH_URL (the address people open in their browser). */
function appOrigin(): string {
  try {
    return new URL(appUrl()).origin;
  } catch {
    return "http://127.0.0.1:3000";
  }
}

/**
 * Throws 403 unless a cookie-authenticated write came from one of our own pages:
 * `Sec-Fetch-Site: same-origin` where the browser sends it (every current one does), otherwise
 * an `Origin` equal to the app's own. A request that carries neither is refused too.
 */
export function assertSameOrigin(headers: Headers): void {
  const site = headers.get("sec-fetch-site");
  const origin = headers.get("origin");
  const own = appOrigin();
  if (site !== null) {
    if (site.toLowerCase() === "same-origin") return;
    throw crossSite(`it came from another site or origin (Sec-Fetch-Site: ${site}${origin ? `, Origin: ${origin}` : ""})`);
  }
  if (origin !== null) {
    if (origin === own) return;
    throw crossSite(`it came from ${origin}, not ${own}`);
  }
  throw crossSite("it carries neither Origin nor Sec-Fetch-Site");
}

function crossSite(why: string): AppError {
  return new AppError(
    "forbidden",
    `Refused a change made with your session cookie: ${why}. Pinchpoint accepts changes only from its own pages at ${appOrigin()} (NEXTAUTH_URL); scripts use an API token.`,
  );
}
