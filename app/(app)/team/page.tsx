import type { Metadata } from "next";
import { TeamView } from "@/components/team/team-view";
import { requirePageUser } from "@/lib/server/session";
import { mailboxVisible } from "@/lib/server/mailbox";

export const metadata: Metadata = { title: "Team" };
export const dynamic = "force-dynamic";

// Members (everyone reads); role changes, removals, invitations and the audit log for the owner.
export default async function TeamPage() {
  const user = await requirePageUser();
  return (
    <TeamView
      me={{ id: user.id, role: user.role, teamName: user.teamName }}
      mailboxHref={mailboxVisible() ? "/dev/mail" : null}
    />
  );
}
