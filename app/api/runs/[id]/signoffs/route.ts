import { errorResponse, readJson } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { addSignoff, listSignoffs } from "@/lib/server/review";
import { signoffDecisionSchema } from "@/lib/schemas/review";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/runs/:id/signoffs – standing decisions newest first (the first is the run's review state) and withdrawn ones (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id } = await routeIds(params, { id: "run" });
    return Response.json(await listSignoffs({ runId: id, teamId: member.teamId }));
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/runs/:id/signoffs – a deliberate decision (no default; changes requested need a note); mails the run's author (owner/reviewer)
export async function POST(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.signOff);
    const { id } = await routeIds(params, { id: "run" });
    const { decision, note } = signoffDecisionSchema.parse(await readJson(request));
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
