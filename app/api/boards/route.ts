import { boardCreateSchema } from "@/lib/schemas/api";
import { createBoard, listBoards } from "@/lib/server/boards";
import { errorResponse, readJson } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";

// GET /api/boards – the team's boards (every role)
export async function GET(request: Request) {
  try {
    const member = await requireMember(request);
    return Response.json({ items: await listBoards({ teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/boards – create a board (owner)
export async function POST(request: Request) {
  try {
    const member = requireRole(await requireMember(request), CAN.manageTeam);
    const input = boardCreateSchema.parse(await readJson(request));
    const board = await createBoard({ teamId: member.teamId, actorId: member.userId, input });
    return Response.json(board, { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
