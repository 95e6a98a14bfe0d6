import { errorResponse, readJson } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { addSignoff, listSignoffs } from "@/lib/server/review";
import { signoffCreateSchema } from "@/lib/schemas/team";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/runs/:id/signoffs – decisions, newest first; the first is the run's review state (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id } = await routeIds(params, { id: "run" });
    return Response.json({ items: await listSignoffs({ runId: id, teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/runs/:id/signoffs – approve or request changes with a note; mails the run's author (owner/reviewer)
export async function POST(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.signOff);
    const { id } = await routeIds(params, { id: "run" });
    const { decision, note } = signoffCreateSchema.parse(await readJson(request));
    const signoff = await addSignoff({
      runId: id,
      teamId: member.teamId,
      reviewer: { userId: member.userId, name: member.name || member.email },
      decision,
      note,
      request,
    });
    return Response.json(signoff, { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
