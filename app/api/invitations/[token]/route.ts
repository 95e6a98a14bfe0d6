import { errorResponse } from "@/lib/server/errors";
import { previewInvitation } from "@/lib/server/team";

// GET /api/invitations/:token – what the invitation offers (no session; the token is the key)
export async function GET(_request: Request, { params }: { params: Promise<{ token: string }> }) {
  try {
    const { token } = await params;
    return Response.json(await previewInvitation({ token }), { headers: { "cache-control": "no-store" } });
  } catch (err) {
    return errorResponse(err);
  }
}
