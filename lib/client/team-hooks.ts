// Compatibility module: the hooks live one module per resource (members.ts, invitations.ts,
// audit.ts, parts.ts, captures.ts, run-links.ts, comments.ts, signoffs.ts); this file only
// re-exports the names components imported from here before the split.
export type { ListOf } from "@/lib/schemas/responses";
export { type AuditEntryJson, auditKey, useAudit } from "./audit";
export { type CaptureRecord, type CaptureSummary, captureKey, capturesKey, useCapture, useCaptures } from "./captures";
export { commentsKey, useComments } from "./comments";
export { invitationsKey, useInvitations } from "./invitations";
export { membersKey, useMembers } from "./members";
export { type PartProfileRecord, partsKey, useParts } from "./parts";
export { runLinksKey, useRunLinks } from "./run-links";
export { signoffsKey, useSignoffs } from "./signoffs";
