import { scenarioCreateSchema } from "@/lib/schemas/api";
import { badRequest, errorResponse, readJson } from "@/lib/server/errors";
import { createScenario, listScenarios } from "@/lib/server/scenarios";
import { CAN, requireMember, requireRole } from "@/lib/server/session";

// GET /api/scenarios?boardId= – the board's scenarios with their latest sign-off (every role)
export async function GET(request: Request) {
  try {
    const member = await requireMember(request);
    const boardId = new URL(request.url).searchParams.get("boardId");
    if (!boardId)
      throw badRequest("boardId is required (?boardId=…)", [{ path: ["boardId"], message: "boardId is required" }]);
    return Response.json({ items: await listScenarios({ boardId, teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/scenarios – create a scenario on a board, version 1 (owner, designer)
export async function POST(request: Request) {
  try {
    const member = requireRole(await requireMember(request), CAN.edit);
    const input = scenarioCreateSchema.parse(await readJson(request));
    const scenario = await createScenario({ teamId: member.teamId, actorId: member.userId, input });
    return Response.json(scenario, { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
