// Coarse redirects only: pages need a session cookie, or go to /signin. Every permission check
// happens on the server in the route handler, server action or page itself.
import { getToken } from "next-auth/jwt";
import { NextResponse, type NextRequest } from "next/server";

export async function proxy(req: NextRequest) {
  const token = await getToken({ req, secret: process.env.NEXTAUTH_SECRET ?? process.env.AUTH_SECRET });
  if (token) return NextResponse.next();
  const url = req.nextUrl.clone();
  url.pathname = "/signin";
  url.search = "";
  url.searchParams.set("callbackUrl", req.nextUrl.pathname + req.nextUrl.search);
  return NextResponse.redirect(url);
}

export const config = {
  // Not the API (it answers 401 JSON itself), not sign-in, not Next's assets.
  // Not /invite/{token} either: the invitee has no session yet, the link is the credential.
  matcher: ["/((?!api/|signin|forbidden|invite/|_next/|favicon.ico|favicon.svg|robots.txt).*)"],
};
