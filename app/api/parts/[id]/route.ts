import { errorResponse, readJson } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { deletePart, getPartOrThrow, updatePart } from "@/lib/server/parts";
import { partProfileBodySchema } from "@/lib/schemas/part";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/parts/:id – one part profile (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id } = await routeIds(params, { id: "part profile" });
    return Response.json(await getPartOrThrow({ id, teamId: member.teamId }));
  } catch (err) {
    return errorResponse(err);
  }
}

// PUT /api/parts/:id – replace name and parameters (owner/designer)
export async function PUT(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.edit);
    const { id } = await routeIds(params, { id: "part profile" });
    const part = partProfileBodySchema.parse(await readJson(request));
    return Response.json(await updatePart({ id, teamId: member.teamId, part }));
  } catch (err) {
    return errorResponse(err);
  }
}

// DELETE /api/parts/:id – remove from the library (owner/designer; audited)
export async function DELETE(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.edit);
    const { id } = await routeIds(params, { id: "part profile" });
    await deletePart({ id, teamId: member.teamId, actorId: member.userId });
    return new Response(null, { status: 204 });
  } catch (err) {
    return errorResponse(err);
  }
}
