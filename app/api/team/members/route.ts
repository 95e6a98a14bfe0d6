import { errorResponse } from "@/lib/server/errors";
import { requireMember } from "@/lib/server/session";
import { listMembers } from "@/lib/server/team";

// GET /api/team/members – the caller's team (every role)
export async function GET(request: Request) {
  try {
    const member = await requireMember(request);
    return Response.json({ items: await listMembers({ teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}
