import { errorResponse } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { listAudit } from "@/lib/server/audit";

// GET /api/team/audit – membership, link, sign-off and delete actions, newest first (owner)
export async function GET(request: Request) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.manageTeam);
    return Response.json({ items: await listAudit({ teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}
