import { errorResponse, readJson } from "@/lib/server/errors";
import { acceptInvitation } from "@/lib/server/team";
import { invitationAcceptSchema } from "@/lib/schemas/team";

// POST /api/invitations/:token/accept – set name + password and join (no session; used/expired → 410)
export async function POST(request: Request, { params }: { params: Promise<{ token: string }> }) {
  try {
    const { token } = await params;
    const { name, password } = invitationAcceptSchema.parse(await readJson(request));
    const joined = await acceptInvitation({ token, name, password });
    return Response.json(joined, { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
