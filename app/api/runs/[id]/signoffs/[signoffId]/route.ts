import { errorResponse } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { withdrawSignoff } from "@/lib/server/review";
import { routeIds } from "@/lib/server/ids";

// DELETE /api/runs/:id/signoffs/:signoffId – withdraw one's own standing decision (owner/reviewer; someone else's is a 403)
export async function DELETE(request: Request, { params }: { params: Promise<{ id: string; signoffId: string }> }) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.signOff);
    const { id, signoffId } = await routeIds(params, { id: "run", signoffId: "sign-off" });
    return Response.json(
      await withdrawSignoff({ runId: id, signoffId, teamId: member.teamId, actorId: member.userId }),
    );
  } catch (err) {
    return errorResponse(err);
  }
}
