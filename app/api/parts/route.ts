import { errorResponse, readJson } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { createPart, listParts } from "@/lib/server/parts";
import { partProfileBodySchema } from "@/lib/schemas/part";

// GET /api/parts – the team's part library (every role)
export async function GET(request: Request) {
  try {
    const member = await requireMember(request);
    return Response.json({ items: await listParts({ teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/parts – add a part profile { name, opamp } (owner/designer; duplicate name → 409)
export async function POST(request: Request) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.edit);
    const part = partProfileBodySchema.parse(await readJson(request));
    return Response.json(await createPart({ teamId: member.teamId, actorId: member.userId, part }), { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
