import { errorResponse, readJson } from "@/lib/server/errors";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { changeMemberRole, removeMember } from "@/lib/server/team";
import { roleChangeSchema } from "@/lib/schemas/team";
import { routeIds } from "@/lib/server/ids";

type Ctx = { params: Promise<{ id: string }> };

// PATCH /api/team/members/:id – change a member's role (owner; the last owner stays owner → 409)
export async function PATCH(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.manageTeam);
    const { id } = await routeIds(params, { id: "member" });
    const { role } = roleChangeSchema.parse(await readJson(request));
    return Response.json(await changeMemberRole({ teamId: member.teamId, actorId: member.userId, memberId: id, role }));
  } catch (err) {
    return errorResponse(err);
  }
}

// DELETE /api/team/members/:id – remove a member (owner; never the last owner → 409)
export async function DELETE(request: Request, { params }: Ctx) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.manageTeam);
    const { id } = await routeIds(params, { id: "member" });
    await removeMember({ teamId: member.teamId, actorId: member.userId, memberId: id });
    return new Response(null, { status: 204 });
  } catch (err) {
    return errorResponse(err);
  }
}
