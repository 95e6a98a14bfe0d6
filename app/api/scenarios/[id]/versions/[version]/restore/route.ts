import { errorResponse } from "@/lib/server/errors";
import { restoreScenarioVersion } from "@/lib/server/scenarios";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { versionNumber } from "@/lib/server/ids";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string; version: string }> };

// POST /api/scenarios/:id/versions/:version/restore – save that version as the newest (owner, designer)
export async function POST(request: Request, { params }: Ctx) {
  try {
    const member = requireRole(await requireMember(request), CAN.edit);
    const { id, version } = { ...(await params), ...(await routeIds(params, { id: "scenario" })) };
    const scenario = await restoreScenarioVersion({
      id,
      teamId: member.teamId,
      actorId: member.userId,
      version: versionNumber(version),
    });
    return Response.json(scenario);
  } catch (err) {
    return errorResponse(err);
  }
}
