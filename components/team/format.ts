// Audit-log wording for the team screens (dates use components/ui/format.ts).
import { formatDate } from "@/components/ui/format";

const ACTIONS: Record<string, string> = {
  "member.role_changed": "changed a role",
  "member.removed": "removed a member",
  "member.joined": "joined the team",
  "invitation.created": "sent an invitation",
  "invitation.revoked": "withdrew an invitation",
  "link.created": "created a run link",
  "link.revoked": "revoked a run link",
  "signoff.created": "signed off a run",
  "part.deleted": "deleted a part profile",
  "parts.imported": "imported part profiles",
  "capture.deleted": "deleted a capture",
  "board.created": "created a board",
  "board.deleted": "deleted a board",
  "scenario.deleted": "deleted a scenario",
  "run.deleted": "deleted a run",
  "run.study.saved": "saved a study with a run",
};

/** Audit action codes in words; unknown codes (from other parts of the app) pass through. */
export function describeAction(action: string): string {
  return ACTIONS[action] ?? action.replace(/[._]/g, " ");
}

/** One line of the details object ("from designer to reviewer", "bo@x.example as viewer"). */
export function describeDetails(details: unknown): string {
  if (!details || typeof details !== "object") return "";
  const d = details as Record<string, unknown>;
  if (typeof d.from === "string" && typeof d.to === "string") return `${d.from} → ${d.to}`;
  if (typeof d.email === "string" && typeof d.role === "string") return `${d.email} as ${d.role}`;
  if (typeof d.decision === "string") return d.decision.replace("_", " ");
  if (typeof d.name === "string") return d.name;
  if (typeof d.label === "string") return d.label;
  if (typeof d.count === "number") return `${d.count} profile${d.count === 1 ? "" : "s"}`;
  if (typeof d.expiresAt === "string") return `expires ${formatDate(d.expiresAt)}`;
  return "";
}
