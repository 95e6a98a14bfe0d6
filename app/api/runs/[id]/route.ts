import { errorResponse } from "@/lib/server/errors";
import { deleteRun, getRunOrThrow } from "@/lib/server/runs";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/runs/:id – one run with snapshot, result and samples (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id } = await routeIds(params, { id: "run" });
    return Response.json(await getRunOrThrow({ id, teamId: member.teamId }));
  } catch (err) {
    return errorResponse(err);
  }
}

// DELETE /api/runs/:id – delete a run with its links, comments and sign-offs (owner, designer)
export async function DELETE(request: Request, { params }: Ctx) {
  try {
    const member = requireRole(await requireMember(request), CAN.edit);
    const { id } = await routeIds(params, { id: "run" });
    await deleteRun({ id, teamId: member.teamId, actorId: member.userId });
    return Response.json({ id, deleted: true });
  } catch (err) {
    return errorResponse(err);
  }
}
