import { errorResponse } from "@/lib/server/errors";
import { runForLinkToken } from "@/lib/server/review";

// GET /api/links/:token – the shared run, read-only, no session (unknown → 404, revoked/expired → 410)
export async function GET(_request: Request, { params }: { params: Promise<{ token: string }> }) {
  try {
    const { token } = await params;
    // no-store: a revoked link must stop working at once, also behind caches.
    return Response.json(await runForLinkToken({ token }), { headers: { "cache-control": "no-store" } });
  } catch (err) {
    return errorResponse(err);
  }
}
