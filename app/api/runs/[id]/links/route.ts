import { errorResponse } from "@/lib/server/errors";
import { readOptionalJson } from "@/lib/server/request";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { createRunLink, listRunLinks } from "@/lib/server/review";
import { linkCreateSchema } from "@/lib/schemas/team";
import { linkLabelSchema } from "@/lib/schemas/review";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/runs/:id/links – the run's links, without tokens (owner/designer)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.edit);
    const { id } = await routeIds(params, { id: "run" });
    return Response.json({ items: await listRunLinks({ runId: id, teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/runs/:id/links – create a read-only link, optional expiry and label (who it is for) (owner/designer); the token is shown once
export async function POST(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.edit);
    const { id } = await routeIds(params, { id: "run" });
    const raw = await readOptionalJson(request);
    const body = linkCreateSchema.parse(raw);
    const { label } = linkLabelSchema.parse(raw);
    const expiresAt = body.expiresAt
      ? new Date(body.expiresAt)
      : body.expiresInDays !== undefined
        ? new Date(Date.now() + body.expiresInDays * 86_400_000)
        : null;
    const link = await createRunLink({
      runId: id,
      teamId: member.teamId,
      actorId: member.userId,
      expiresAt,
      label: label || null,
      request,
    });
    return Response.json(link, { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
