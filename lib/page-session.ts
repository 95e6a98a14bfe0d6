import "server-only";
import { getServerSession } from "next-auth";
import { redirect } from "next/navigation";
import { authOptions } from "@/lib/auth";
import type { Role } from "@/lib/schemas/roles";
import { CAN } from "@/lib/server/session";

/** A member's role as pages see it: the one role list of lib/schemas/roles.ts. */
export type MemberRole = Role;

export interface PageUser {
  id: string;
  name: string | null;
  email: string | null;
  role: MemberRole;
  teamId: string;
  teamName: string;
}

/** May create, edit and delete scenarios, runs, captures and part profiles: the role table's `edit` row (lib/server/session.ts, DEVELOPERS.md § Roles). */
export function canEdit(role: MemberRole): boolean {
  return (CAN.edit as readonly Role[]).includes(role);
}

/** The signed-in member for a server page, or null. Pages only decide what to show; route handlers enforce. */
export async function getPageUser(): Promise<PageUser | null> {
  const session = await getServerSession(authOptions);
  const u = session?.user;
  if (!u?.id || !u.role) return null;
  return {
    id: u.id,
    name: u.name ?? null,
    email: u.email ?? null,
    role: u.role,
    teamId: u.teamId,
    teamName: u.teamName,
  };
}

/** Same, but sends anyone without a session to the sign-in page. */
export async function requirePageUser(): Promise<PageUser> {
  const user = await getPageUser();
  if (!user) redirect("/signin");
  return user;
}
