// Runs before pages are rendered (not before API routes: a proxy in front of a route handler
// would buffer its request body). A page path whose percent-encoding does not decode
// (e.g. /boards/%ff%fe) names no page: 404 here instead of an error while rendering.
// No database or Node-only import here.
import { NextResponse, type NextRequest } from "next/server";

function decodes(pathname: string): boolean {
  try {
    decodeURIComponent(pathname);
    return !pathname.includes("%00");
  } catch {
    return false;
  }
}

export function proxy(request: NextRequest) {
  if (!decodes(request.nextUrl.pathname) && request.nextUrl.pathname.startsWith("/api/")) {
    return NextResponse.json(
      { error: "not_found", message: "No such item: the address is not valid." },
      { status: 404, headers: { "cache-control": "no-store" } },
    );
  }
  if (!decodes(request.nextUrl.pathname)) {
    return new NextResponse("Not found: this address is not valid.", {
      status: 404,
      headers: { "content-type": "text/plain; charset=utf-8", "cache-control": "no-store" },
    });
  }
  return NextResponse.next();
}

export const config = {
  matcher: [
    "/((?!api/|_next/static|_next/image|favicon\\.ico).*)",
    // API paths only when they carry a percent sign: no valid API id or token has one, so
    // normal API requests never pass through here, and an undecodable id (%ff%fe) or a NUL
    // is a 404 instead of Next's own 500 before the route handler runs.
    "/api/:rest(.*%.*)",
  ],
};
