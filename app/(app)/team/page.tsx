import type { Metadata } from "next";
import { TeamView } from "@/components/team/team-view";
import { requirePageUser } from "@/lib/page-session";

export const metadata: Metadata = { title: "Team" };

// Members (everyone reads); role changes, removals, invitations and the audit log for the owner.
export default async function TeamPage() {
  const user = await requirePageUser();
  return <TeamView me={{ id: user.id, role: user.role, teamName: user.teamName }} />;
}
