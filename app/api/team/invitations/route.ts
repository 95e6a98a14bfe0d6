import { errorResponse, readJson } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { createInvitation, listPendingInvitations } from "@/lib/server/team";
import { invitationCreateSchema } from "@/lib/schemas/team";

// GET /api/team/invitations – pending invitations (owner)
export async function GET(request: Request) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.manageTeam);
    return Response.json({ items: await listPendingInvitations({ teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/team/invitations – invite by e-mail with a role (owner); mails a single-use link
export async function POST(request: Request) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.manageTeam);
    const { email, role } = invitationCreateSchema.parse(await readJson(request));
    const invitation = await createInvitation({
      teamId: member.teamId,
      actorId: member.userId,
      actorName: member.name || member.email,
      email,
      role,
      request,
    });
    return Response.json(invitation, { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
