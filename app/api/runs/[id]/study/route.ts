import { errorResponse } from "@/lib/server/errors";
import { readLimitedBody } from "@/lib/server/request";
import { requireMember, requireRole, CAN } from "@/lib/server/session";
import { getRunStudyOrThrow, saveRunStudy } from "@/lib/server/studies";
import { studyUploadSchema } from "@/lib/schemas/study";
import { AppError } from "@/lib/server/errors";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

/** 20,000 tasks of raw outputs stay well under this. */
const STUDY_BODY_LIMIT = 8 * 1024 * 1024;

// GET /api/runs/:id/study – the study saved with a run, or null (every role)
export async function GET(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    const { id } = await routeIds(params, { id: "run" });
    return Response.json({ study: await getRunStudyOrThrow({ runId: id, teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}

// PUT /api/runs/:id/study – store a noise margin study and/or tolerance spread with a run (owner/designer)
export async function PUT(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.edit);
    const { id } = await routeIds(params, { id: "run" });
    const bytes = await readLimitedBody(request, STUDY_BODY_LIMIT);
    let body: unknown;
    try {
      body = JSON.parse(new TextDecoder().decode(bytes));
    } catch {
      throw new AppError("invalid_json", "The request body must be JSON.");
    }
    const upload = studyUploadSchema.parse(body);
    const study = await saveRunStudy({ runId: id, teamId: member.teamId, actorId: member.userId, upload });
    return Response.json({ id, study });
  } catch (err) {
    return errorResponse(err);
  }
}
