import { errorResponse } from "@/lib/server/errors";
import { runForLinkToken } from "@/lib/server/review";

// GET /api/links/:token – the shared run, read-only, no session (unknown → 404, revoked/expired → 410)
export async function GET(_request: Request, { params }: { params: Promise<{ token: string }> }) {
  try {
    const { token } = await params;
    // no-store: a revoked link must stop working at once, also behind caches.
    // The team id stays on the server: a link holder sees the run, nothing of the team.
    const { teamId: _teamId, ...shared } = await runForLinkToken({ token });
    void _teamId;
    return Response.json(shared, { headers: { "cache-control": "no-store" } });
  } catch (err) {
    return errorResponse(err);
  }
}
