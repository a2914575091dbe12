import { getSessionCookie } from "better-auth/cookies";
import { NextResponse, type NextRequest } from "next/server";
import { databaseAnswers } from "@/lib/server/database-gate";
import { contentSecurityPolicy, makeNonce } from "@/lib/security-headers";
import { unavailablePage } from "@/lib/unavailable-page";

/** The signed-in pages: "/" and "/sites/:path*". */
function isSignedInPage(pathname: string): boolean {
  return pathname === "/" || pathname === "/sites" || pathname.startsWith("/sites/");
}

/** Pages that read the database as they render (all but the local mail sink's). */
function readsDatabase(pathname: string): boolean {
  return !pathname.startsWith("/dev/");
}

// Three jobs. Every page gets a content security policy with a fresh nonce: Next reads
// it from the request's header and puts it on its own inline scripts, and the browser
// reads it from the response's. The signed-in pages get only an optimistic check that a
// session cookie exists, to spare signed-out people a round of rendering; every page
// checks the session for real. And a page whose database does not answer gets a 503
// page saying so at once, instead of failing part-way through its render.
export async function proxy(request: NextRequest) {
  const { pathname } = request.nextUrl;
  if (isSignedInPage(pathname) && !getSessionCookie(request)) {
    return NextResponse.redirect(new URL("/sign-in", request.url));
  }
  const nonce = makeNonce();
  const policy = contentSecurityPolicy({ nonce, dev: process.env.NODE_ENV === "development" });
  if (readsDatabase(pathname) && !(await databaseAnswers())) {
    return new NextResponse(unavailablePage({ nonce }), {
      status: 503,
      headers: {
        "content-type": "text/html; charset=utf-8",
        "content-security-policy": policy,
        "retry-after": "30",
        "cache-control": "no-store",
      },
    });
  }
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set("content-security-policy", policy);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set("content-security-policy", policy);
  return response;
}

// Every page, not-found included; not /api (no documents there: the fixed headers of
// next.config.ts cover it, and handlers answer 503 themselves), nor the build's static
// files and the icon.
export const config = {
  matcher: ["/((?!api/|_next/static|_next/image|favicon\\.ico|icon\\.svg).*)"],
};
