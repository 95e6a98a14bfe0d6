import { errorResponse } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { revokeRunLink } from "@/lib/server/review";
import { routeIds } from "@/lib/server/ids";

// DELETE /api/runs/:id/links/:linkId – revoke a link; takes effect on the next request (owner/designer)
export async function DELETE(request: Request, { params }: { params: Promise<{ id: string; linkId: string }> }) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.edit);
    const { id, linkId } = await routeIds(params, { id: "run", linkId: "run link" });
    return Response.json(await revokeRunLink({ runId: id, linkId, teamId: member.teamId, actorId: member.userId }));
  } catch (err) {
    return errorResponse(err);
  }
}
