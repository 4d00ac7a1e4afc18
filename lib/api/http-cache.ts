// Conditional GET for analysis responses (RFC 9110 §8.8.3 ETag, §13.1.2 If-None-Match; RFC 9111
// §5.2.2 Cache-Control). The results of an analysis never change, but the response also shows the
// effective owners and the analysis in progress, so its ETag covers all three (ServedAnalysis.version)
// plus the query. It is weak: the body's snapshot age moves with the clock, the meaning does not.
// `private, no-cache`: a browser may keep the body but asks every time, and a 304 costs no query
// beyond the state check.
import { createHash } from "node:crypto";

export function etagOf(...parts: readonly string[]): string {
  return `W/"${createHash("sha1").update(parts.join("\u0000")).digest("base64url").slice(0, 22)}"`;
}

/** Whether If-None-Match names this ETag (weak comparison, RFC 9110 §8.8.3.2). */
function matches(req: Request, etag: string): boolean {
  const header = req.headers.get("if-none-match");
  if (!header) return false;
  if (header.trim() === "*") return true;
  const bare = (t: string) => t.trim().replace(/^W\//, "");
  return header.split(",").some((t) => bare(t) === bare(etag));
}

const CACHE_HEADERS = { "cache-control": "private, no-cache", vary: "authorization, cookie" } as const;

/** 304 when the client already holds this version, else null. */
export function notModified(req: Request, etag: string): Response | null {
  return matches(req, etag) ? new Response(null, { status: 304, headers: { etag, ...CACHE_HEADERS } }) : null;
}

/** A JSON body already serialised, with the validators. */
export function jsonWithEtag(body: string | Uint8Array<ArrayBuffer>, etag: string): Response {
  return new Response(body, { status: 200, headers: { "content-type": "application/json", etag, ...CACHE_HEADERS } });
}
