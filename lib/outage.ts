// While PostgreSQL is unreachable every page answers 503 with Retry-After and says so, instead of an
// error page or a sign-in form that cannot work. The proxy asks before each page; the answer is
// shared for a moment so that a busy instance probes the database at most once a second or so.
import { pingDatabase } from "@/lib/data/health";
import { DATABASE_RETRY_AFTER_S } from "@/lib/errors";

const FRESH_MS = 1_500;
const state = globalThis as unknown as { __pinchpointDbProbe?: { at: number; ok: boolean; pending?: Promise<boolean> } };

export async function databaseReachable(): Promise<boolean> {
  const now = Date.now();
  const last = state.__pinchpointDbProbe;
  if (last?.pending) return last.pending;
  if (last && now - last.at < FRESH_MS) return last.ok;
  const pending = pingDatabase()
    .then((r) => r.ok)
    .catch(() => true) // a probe that fails for another reason must not take every page down
    .then((ok) => {
      state.__pinchpointDbProbe = { at: Date.now(), ok };
      return ok;
    });
  state.__pinchpointDbProbe = { at: last?.at ?? 0, ok: last?.ok ?? true, pending };
  return pending;
}

/** Forget the last probe (tests that take the database away and bring it back). */
export function forgetDatabaseProbe(): void {
  state.__pinchpointDbProbe = undefined;
}

export function outagePage(): Response {
  const html = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Pinchpoint is waiting for its database</title>
<meta name="viewport" content="width=device-width, initial-scale=1">
<style>body{font:16px/1.5 system-ui,sans-serif;margin:0;display:grid;place-items:center;min-height:100vh;background:#14161a;color:#e8e6e1}main{max-width:32rem;padding:2rem}h1{font-size:1.25rem}p{color:#b8b4ac}</style></head>
<body><main><h1>Pinchpoint cannot reach its database</h1>
<p>Nothing is wrong with this page or your account: PostgreSQL is not answering right now. This page will work again as soon as it does; try again in a few seconds.</p>
<p>If it lasts, the people who run Pinchpoint can check <code>/api/health</code>.</p></main></body></html>`;
  return new Response(html, {
    status: 503,
    headers: {
      "content-type": "text/html; charset=utf-8",
      "cache-control": "no-store",
      "retry-after": String(DATABASE_RETRY_AFTER_S),
      "content-security-policy": "default-src 'none'; style-src 'unsafe-inline'; frame-ancestors 'none'",
    },
  });
}
