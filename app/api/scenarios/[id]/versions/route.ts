import { errorResponse } from "@/lib/server/errors";
import { listScenarioVersions } from "@/lib/server/scenarios";
import { requireMember } from "@/lib/server/session";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/scenarios/:id/versions – version history, newest first, without the documents (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id } = await routeIds(params, { id: "scenario" });
    return Response.json({ items: await listScenarioVersions({ id, teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}
