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
  "signoff.created": "signed off",
  "signoff.withdrawn": "withdrew a sign-off",
  "review.requested": "requested a review",
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

const DECISION_WORDS: Record<string, string> = { approved: "approved", changes_requested: "changes requested" };

/** The audit entry's subject in words: "Tomas Berge", 'run "Cut-off check" of Battery low-voltage disconnect'. */
export function describeTarget(e: { targetName?: string | null; targetType: string | null }): string {
  return e.targetName ?? (e.targetType ? `(a ${e.targetType} no longer here)` : "");
}

/** One line of the details object ("designer → reviewer", "bo@x.example as viewer", "approved, version 3"). */
export function describeDetails(details: unknown): string {
  if (!details || typeof details !== "object") return "";
  const d = details as Record<string, unknown>;
  if (typeof d.from === "string" && typeof d.to === "string") return `${d.from} → ${d.to}`;
  if (typeof d.decision === "string") {
    const v = typeof d.scenarioVersion === "number" ? `, version ${d.scenarioVersion}` : "";
    return `${DECISION_WORDS[d.decision] ?? d.decision.replace("_", " ")}${v}`;
  }
  if (Array.isArray(d.reviewerNames) && d.reviewerNames.length) return `from ${d.reviewerNames.join(", ")}`;
  if (Array.isArray(d.reviewerIds)) return `${d.reviewerIds.length} reviewer${d.reviewerIds.length === 1 ? "" : "s"}`;
  if (typeof d.label === "string" && d.label) return `for ${d.label}`;
  if (typeof d.email === "string" && typeof d.role === "string") return `${d.email} as ${d.role}`;
  if (typeof d.decision === "string") return d.decision.replace("_", " ");
  if (typeof d.name === "string") return d.name;
  if (typeof d.label === "string") return d.label;
  if (typeof d.count === "number") return `${d.count} profile${d.count === 1 ? "" : "s"}`;
  if (typeof d.expiresAt === "string") return `expires ${formatDate(d.expiresAt)}`;
  return "";
}
