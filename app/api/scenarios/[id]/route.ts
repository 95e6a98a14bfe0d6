import { scenarioUpdateSchema } from "@/lib/schemas/api";
import { errorResponse, readJson } from "@/lib/server/errors";
import { deleteScenario, getScenarioOrThrow, updateScenario } from "@/lib/server/scenarios";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/scenarios/:id – the current version (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id } = await routeIds(params, { id: "scenario" });
    return Response.json(await getScenarioOrThrow({ id, teamId: member.teamId }));
  } catch (err) {
    return errorResponse(err);
  }
}

// PUT /api/scenarios/:id – save a new version (owner, designer)
export async function PUT(request: Request, { params }: Ctx) {
  try {
    const member = requireRole(await requireMember(request), CAN.edit);
    const { id } = await routeIds(params, { id: "scenario" });
    await getScenarioOrThrow({ id, teamId: member.teamId });
    const input = scenarioUpdateSchema.parse(await readJson(request));
    return Response.json(await updateScenario({ id, teamId: member.teamId, actorId: member.userId, input }));
  } catch (err) {
    return errorResponse(err);
  }
}

// DELETE /api/scenarios/:id – delete with its versions and runs (owner, designer)
export async function DELETE(request: Request, { params }: Ctx) {
  try {
    const member = requireRole(await requireMember(request), CAN.edit);
    const { id } = await routeIds(params, { id: "scenario" });
    await deleteScenario({ id, teamId: member.teamId, actorId: member.userId });
    return Response.json({ id, deleted: true });
  } catch (err) {
    return errorResponse(err);
  }
}
