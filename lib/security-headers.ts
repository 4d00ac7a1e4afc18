// Response headers that tell the browser what our pages may do. Edge-safe (no Node imports): the
// proxy builds the page policy per request, next.config.mjs sets the fixed ones on every response.

/**
 * The page policy. Scripts need this request's nonce ('strict-dynamic' lets the scripts Next loads
 * with it load their chunks); styles allow inline because React Flow and the charts position things
 * with style attributes, which a nonce cannot cover (common practice for React apps). Workers
 * (the map's ELK layout) come from our own origin. Nothing may frame a page, and nothing else is
 * fetched, posted to or embedded from anywhere else.
 */
export function pageContentSecurityPolicy({ nonce, dev }: { nonce: string; dev: boolean }): string {
  const directives: Record<string, string[]> = {
    "default-src": ["'self'"],
    "script-src": ["'self'", `'nonce-${nonce}'`, "'strict-dynamic'", ...(dev ? ["'unsafe-eval'"] : [])],
    "style-src": ["'self'", "'unsafe-inline'"],
    "img-src": ["'self'", "data:", "blob:"],
    "font-src": ["'self'", "data:"],
    "connect-src": ["'self'", ...(dev ? ["ws:"] : [])],
    "worker-src": ["'self'", "blob:"],
    "frame-src": ["'self'"],
    "object-src": ["'none'"],
    "base-uri": ["'none'"],
    "form-action": ["'self'"],
    "frame-ancestors": ["'none'"],
  };
  return Object.entries(directives)
    .map(([name, values]) => `${name} ${values.join(" ")}`)
    .join("; ");
}

/** API responses are JSON, CSV or YAML: nothing in them may run or be framed. */
export const API_CONTENT_SECURITY_POLICY = "default-src 'none'; frame-ancestors 'none'";

/** On every response, whatever serves it (set in next.config.mjs). */
export const FIXED_SECURITY_HEADERS: ReadonlyArray<{ key: string; value: string }> = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  // Internal URLs name environments and components: other sites get nothing, our own pages the full path.
  { key: "Referrer-Policy", value: "same-origin" },
  // For browsers that predate frame-ancestors.
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=()" },
];

/**
 * Strict-Transport-Security only when the app's public address is https: a browser must never be
 * told to insist on https for an address served over plain http (the default 127.0.0.1:3000).
 * A year without subdomains, common practice for a first deployment.
 */
export function strictTransportSecurity(publicUrl: string): string | null {
  try {
    return new URL(publicUrl).protocol === "https:" ? "max-age=31536000" : null;
  } catch {
    return null;
  }
}
