import "server-only";
// Who is calling, for route handlers. The role is re-read from the database on every call
// (a token's role can be stale after a role change or removal), so writes use today's role.
import { getServerSession } from "next-auth";
import { authOptions } from "@/lib/auth";
import type { Role } from "@/lib/schemas/roles";
import { findMembership } from "./accounts";
import { forbidden, unauthorized } from "./errors";

export interface Member {
  userId: string;
  teamId: string;
  teamName: string;
  role: Role;
  name: string;
  email: string;
}

/** Roles per action (DESIGN.md "Roles"). */
export const CAN = {
  read: ["owner", "designer", "reviewer", "viewer"],
  edit: ["owner", "designer"], // scenarios, runs, captures, part profiles, run links
  comment: ["owner", "designer", "reviewer"],
  signOff: ["owner", "reviewer"],
  manageTeam: ["owner"], // invite, change roles, remove members, create boards
} as const satisfies Record<string, readonly Role[]>;

/** The signed-in member (401 without a valid session). `request` is accepted for symmetry; the
 * session cookie is read through next/headers. */
export async function requireMember(_request?: Request): Promise<Member> {
  void _request;
  const session = await getServerSession(authOptions);
  const user = session?.user;
  if (!user?.id || !user.teamId) throw unauthorized();
  const member = await findMembership({ userId: user.id, teamId: user.teamId });
  if (!member) throw unauthorized("Your membership has ended; sign in again.");
  return member;
}

/** Throws 403 unless the member's role is one of `roles`; returns the member for chaining. */
export function requireRole(member: Member, roles: readonly Role[]): Member {
  if (!roles.includes(member.role)) {
    throw forbidden(`Your role (${member.role}) does not allow this; it needs ${roles.join(" or ")}.`);
  }
  return member;
}
