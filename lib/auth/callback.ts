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
