import { getSessionCookie } from "better-auth/cookies";
import { NextResponse, type NextRequest } from "next/server";
import { databaseAnswers } from "@/lib/server/database-gate";
import { unavailablePage } from "@/lib/unavailable-page";

export async function proxy(request: NextRequest) {
  // Only an optimistic check that a session cookie exists, to spare signed-out people a
  // round of rendering; every page checks the session for real.
  if (!getSessionCookie(request)) return NextResponse.redirect(new URL("/sign-in", request.url));
  // Every page reads the database: when it does not answer, say so at once with a 503.
  if (!(await databaseAnswers())) {
    return new NextResponse(unavailablePage(), {
      status: 503,
      headers: { "content-type": "text/html; charset=utf-8", "retry-after": "30", "cache-control": "no-store" },
    });
  }
  return NextResponse.next();
}

// Only the signed-in pages: never /api, /_next, static files or the sign-in/up pages.
export const config = {
  matcher: ["/", "/sites/:path*"],
};
