import { runCreateSchema } from "@/lib/schemas/api";
import { badRequest, errorResponse, readJson } from "@/lib/server/errors";
import { createRun, listRuns } from "@/lib/server/runs";
import { CAN, requireMember, requireRole } from "@/lib/server/session";

// Server-side simulation needs Node (typed arrays, CPU); never the edge runtime.
export const runtime = "nodejs";

// GET /api/runs?scenarioId= – the scenario's runs, newest first, without samples (every role)
export async function GET(request: Request) {
  try {
    const member = await requireMember(request);
    const scenarioId = new URL(request.url).searchParams.get("scenarioId");
    if (!scenarioId)
      throw badRequest("scenarioId is required (?scenarioId=…)", [
        { path: ["scenarioId"], message: "scenarioId is required" },
      ]);
    return Response.json({ items: await listRuns({ scenarioId, teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/runs – re-run the stored scenario on the server and save the run (owner, designer)
export async function POST(request: Request) {
  try {
    const member = requireRole(await requireMember(request), CAN.edit);
    const input = runCreateSchema.parse(await readJson(request));
    const run = await createRun({
      scenarioId: input.scenarioId,
      teamId: member.teamId,
      actorId: member.userId,
      label: input.label,
    });
    return Response.json(run, { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
