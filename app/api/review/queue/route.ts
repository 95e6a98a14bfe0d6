import { errorResponse } from "@/lib/server/errors";
import { requireMember } from "@/lib/server/session";
import { reviewQueue } from "@/lib/server/review";

// GET /api/review/queue?boardId= – runs waiting on me, runs I asked others about, and decided runs (every role)
export async function GET(request: Request) {
  try {
    const member = await requireMember(request);
    const boardId = new URL(request.url).searchParams.get("boardId");
    return Response.json(await reviewQueue({ teamId: member.teamId, userId: member.userId, boardId: boardId || null }));
  } catch (err) {
    return errorResponse(err);
  }
}
