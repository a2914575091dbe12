import { getSessionCookie } from "better-auth/cookies";
import { NextResponse, type NextRequest } from "next/server";
import { contentSecurityPolicy, makeNonce } from "@/lib/security-headers";

/** The signed-in pages: "/" and "/sites/:path*". */
function isSignedInPage(pathname: string): boolean {
  return pathname === "/" || pathname === "/sites" || pathname.startsWith("/sites/");
}

// Two jobs. Every page gets a content security policy with a fresh nonce: Next reads it
// from the request's header and puts it on its own inline scripts, and the browser reads
// it from the response's. And the signed-in pages get only an optimistic check that a
// session cookie exists, to spare signed-out people a round of rendering; every page
// checks the session for real.
export function proxy(request: NextRequest) {
  if (isSignedInPage(request.nextUrl.pathname) && !getSessionCookie(request)) {
    return NextResponse.redirect(new URL("/sign-in", request.url));
  }
  const policy = contentSecurityPolicy({ nonce: makeNonce(), dev: process.env.NODE_ENV === "development" });
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set("content-security-policy", policy);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set("content-security-policy", policy);
  return response;
}

// Every page, not-found included; not /api (no documents there: the fixed headers of
// next.config.ts cover it), nor the build's static files and the icon.
export const config = {
  matcher: ["/((?!api/|_next/static|_next/image|favicon\\.ico|icon\\.svg).*)"],
};
