import { boardPatchSchema } from "@/lib/schemas/api";
import { deleteBoard, getBoardOrThrow, updateBoard } from "@/lib/server/boards";
import { errorResponse, readJson } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/boards/:id – one board (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id } = await routeIds(params, { id: "board" });
    return Response.json(await getBoardOrThrow({ id, teamId: member.teamId }));
  } catch (err) {
    return errorResponse(err);
  }
}

// PATCH /api/boards/:id – rename or describe a board (owner)
export async function PATCH(request: Request, { params }: Ctx) {
  try {
    const member = requireRole(await requireMember(request), CAN.manageTeam);
    const { id } = await routeIds(params, { id: "board" });
    await getBoardOrThrow({ id, teamId: member.teamId });
    const patch = boardPatchSchema.parse(await readJson(request));
    return Response.json(await updateBoard({ id, teamId: member.teamId, patch }));
  } catch (err) {
    return errorResponse(err);
  }
}

// DELETE /api/boards/:id – delete a board with its scenarios and runs (owner)
export async function DELETE(request: Request, { params }: Ctx) {
  try {
    const member = requireRole(await requireMember(request), CAN.manageTeam);
    const { id } = await routeIds(params, { id: "board" });
    await deleteBoard({ id, teamId: member.teamId, actorId: member.userId });
    return Response.json({ id, deleted: true });
  } catch (err) {
    return errorResponse(err);
  }
}
