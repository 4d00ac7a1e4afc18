// Runs before every page (not the API, not Next's static files): a fresh script nonce and the page's
// Content-Security-Policy; 503 while the database is unreachable, so a page never looks like a bug
// or sends people to sign in again; and coarse redirects of anonymous visits to /signin. Every
// permission check happens on the server in the route handler or page itself.
import { getToken } from "next-auth/jwt";
import { NextResponse, type NextRequest } from "next/server";
import { pageContentSecurityPolicy, strictTransportSecurity } from "@/lib/security-headers";
import { databaseReachable, outagePage } from "@/lib/outage";
import { appUrl } from "@/lib/config";

/** Pages that need no session: sign-in, the refusal page, invite links (the link is the credential). */
const OPEN_PAGES = /^\/(signin|forbidden|invite\/)/;

export async function proxy(req: NextRequest) {
  if (!(await databaseReachable())) return outagePage();

  if (!OPEN_PAGES.test(req.nextUrl.pathname)) {
    const token = await getToken({ req, secret: process.env.NEXTAUTH_SECRET ?? process.env.AUTH_SECRET });
    if (!token) {
      const url = req.nextUrl.clone();
      url.pathname = "/signin";
      url.search = "";
      url.searchParams.set("callbackUrl", req.nextUrl.pathname + req.nextUrl.search);
      return NextResponse.redirect(url);
    }
  }

  // Next applies the nonce in the request's policy to its own scripts; the root layout reads x-nonce.
  const nonce = btoa(crypto.randomUUID());
  const policy = pageContentSecurityPolicy({ nonce, dev: process.env.NODE_ENV === "development" });
  const requestHeaders = new Headers(req.headers);
  requestHeaders.set("x-nonce", nonce);
  requestHeaders.set("content-security-policy", policy);
  const res = NextResponse.next({ request: { headers: requestHeaders } });
  res.headers.set("content-security-policy", policy);
  const hsts = strictTransportSecurity(appUrl());
  if (hsts) res.headers.set("strict-transport-security", hsts);
  return res;
}

export const config = {
  matcher: [
    {
      // Not the API (it answers JSON itself, 401 and 503 included) and not Next's assets.
      source: "/((?!api/|_next/static|_next/image|favicon.ico|favicon.svg|robots.txt).*)",
      // Link prefetches are not pages being shown: no policy, no database probe.
      missing: [
        { type: "header", key: "next-router-prefetch" },
        { type: "header", key: "purpose", value: "prefetch" },
      ],
    },
  ],
};
