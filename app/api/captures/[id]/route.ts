import { errorResponse } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { deleteCapture, getCaptureOrThrow } from "@/lib/server/captures";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/captures/:id – one capture with its [t, v] samples (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id } = await routeIds(params, { id: "capture" });
    return Response.json(await getCaptureOrThrow({ id, teamId: member.teamId }));
  } catch (err) {
    return errorResponse(err);
  }
}

// DELETE /api/captures/:id – remove a capture (owner/designer; audited)
export async function DELETE(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.edit);
    const { id } = await routeIds(params, { id: "capture" });
    await deleteCapture({ id, teamId: member.teamId, actorId: member.userId });
    return new Response(null, { status: 204 });
  } catch (err) {
    return errorResponse(err);
  }
}
