import { AppError, errorResponse, readJson } from "@/lib/server/errors";
import {
  clientAddress,
  guardRequest,
  INVITE_ADDRESS,
  lockedFor,
  recordFailure,
  tooManyRequests,
} from "@/lib/server/session";
import { acceptInvitation } from "@/lib/server/team";
import { invitationAcceptSchema } from "@/lib/schemas/team";

// POST /api/invitations/:token/accept – set name + password and join (no session; used/expired → 410)
export async function POST(request: Request, { params }: { params: Promise<{ token: string }> }) {
  // Guessing tokens or passwords is limited per client address (429, stored in the database).
  const addressKey = `invite:address:${clientAddress(request)}`;
  try {
    guardRequest(request);
    const wait = await lockedFor(addressKey);
    if (wait > 0) {
      const res = errorResponse(tooManyRequests(wait));
      res.headers.set("Retry-After", String(wait));
      return res;
    }
    const { token } = await params;
    const { name, password } = invitationAcceptSchema.parse(await readJson(request));
    try {
      const joined = await acceptInvitation({ token, name, password });
      return Response.json(joined, { status: 201 });
    } catch (err) {
      if (err instanceof AppError && [400, 401, 403, 404, 410].includes(err.status))
        await recordFailure(addressKey, INVITE_ADDRESS);
      throw err;
    }
  } catch (err) {
    return errorResponse(err);
  }
}
