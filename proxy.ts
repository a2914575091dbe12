import { getSessionCookie } from "better-auth/cookies";
import { NextResponse, type NextRequest } from "next/server";

// Only an optimistic check that a session cookie exists, to spare signed-out people a
// round of rendering; every page checks the session for real.
export function proxy(request: NextRequest) {
  if (getSessionCookie(request)) return NextResponse.next();
  return NextResponse.redirect(new URL("/sign-in", request.url));
}

// Only the signed-in pages: never /api, /_next, static files or the sign-in/up pages.
export const config = {
  matcher: ["/", "/sites/:path*"],
};
