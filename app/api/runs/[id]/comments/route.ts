import { errorResponse, readJson } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { addComment, listComments } from "@/lib/server/review";
import { commentCreateSchema } from "@/lib/schemas/team";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/runs/:id/comments – oldest first (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id } = await routeIds(params, { id: "run" });
    return Response.json({ items: await listComments({ runId: id, teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/runs/:id/comments – plain-text comment; mails the run's participants (owner/designer/reviewer)
export async function POST(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.comment);
    const { id } = await routeIds(params, { id: "run" });
    const { body } = commentCreateSchema.parse(await readJson(request));
    const comment = await addComment({
      runId: id,
      teamId: member.teamId,
      author: { userId: member.userId, name: member.name || member.email },
      body,
      request,
    });
    return Response.json(comment, { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
