import { errorResponse } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { revokeInvitation } from "@/lib/server/team";
import { routeIds } from "@/lib/server/ids";

// DELETE /api/team/invitations/:id – withdraw a pending invitation (owner)
export async function DELETE(request: Request, { params }: { params: Promise<{ id: string }> }) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.manageTeam);
    const { id } = await routeIds(params, { id: "pending invitation" });
    await revokeInvitation({ teamId: member.teamId, actorId: member.userId, invitationId: id });
    return new Response(null, { status: 204 });
  } catch (err) {
    return errorResponse(err);
  }
}
