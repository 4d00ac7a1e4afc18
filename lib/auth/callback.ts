// Where to go after sign-in: only a path on this site. "/\evil.example" and "//evil.example" parse
// to another origin, so the check is on the parsed URL, not on the string's first characters.
const BASE = "http://pinchpoint.invalid";

export function sameOriginPath(callbackUrl: string | null | undefined): string {
  if (!callbackUrl) return "/";
  try {
    const url = new URL(callbackUrl, BASE);
    if (url.origin !== BASE) return "/";
    return `${url.pathname}${url.search}${url.hash}`;
  } catch {
    return "/";
  }
}

/**
 * next-auth's redirect callback: where to send the browser after signing in or out. next-auth's
 * default parses the callbackUrl with `new URL()` unguarded, so a malformed one (`http://[`) threw
 * and the sign-in answered 500. Anything that does not parse, or points elsewhere, goes home.
 */
export function safeRedirect({ url, baseUrl }: { url: string; baseUrl: string }): string {
  try {
    const base = new URL(baseUrl);
    const target = new URL(url, base);
    return target.origin === base.origin ? target.toString() : base.toString();
  } catch {
    return baseUrl;
  }
}
