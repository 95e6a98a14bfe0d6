import { errorResponse } from "@/lib/server/errors";
import { versionNumber } from "@/lib/server/ids";
import { getScenarioVersionOrThrow } from "@/lib/server/scenarios";
import { requireMember } from "@/lib/server/session";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string; version: string }> };

// GET /api/scenarios/:id/versions/:version – one stored version with its document (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id, version } = { ...(await params), ...(await routeIds(params, { id: "scenario" })) };
    return Response.json(
      await getScenarioVersionOrThrow({ id, teamId: member.teamId, version: versionNumber(version) }),
    );
  } catch (err) {
    return errorResponse(err);
  }
}
