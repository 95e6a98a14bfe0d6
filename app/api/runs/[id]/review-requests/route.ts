import { errorResponse, readJson } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { listReviewRequests, requestReview } from "@/lib/server/review";
import { reviewRequestCreateSchema } from "@/lib/schemas/review";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// GET /api/runs/:id/review-requests – who was asked to review the run, and what each decided (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id } = await routeIds(params, { id: "run" });
    return Response.json({ items: await listReviewRequests({ runId: id, teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/runs/:id/review-requests – ask owners/reviewers to review the run; each new reviewer gets a mail (owner/designer)
export async function POST(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.edit);
    const { id } = await routeIds(params, { id: "run" });
    const { reviewerIds, note } = reviewRequestCreateSchema.parse(await readJson(request));
    const items = await requestReview({
      runId: id,
      teamId: member.teamId,
      actor: { userId: member.userId, name: member.name || member.email },
      reviewerIds,
      note,
      request,
    });
    return Response.json({ items }, { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
