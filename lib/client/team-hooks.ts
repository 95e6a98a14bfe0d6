// SWR hooks for the team side (one per resource; keys are the API URLs, DEVELOPERS.md).
import useSWR from "swr";
import { fetchJson } from "./fetcher";
import type { CommentJson, InvitationJson, MemberJson, RunLinkJson, SignoffJson } from "@/lib/schemas/team";
import type { AuditJson, CaptureJson, CaptureSummaryJson, ListOf, PartProfileJson } from "@/lib/schemas/responses";

// Response types come from the schemas (lib/schemas/responses.ts); the old names stay as aliases.
export type { ListOf };
export type AuditEntryJson = AuditJson;
export type PartProfileRecord = PartProfileJson;
export type CaptureSummary = CaptureSummaryJson;
export type CaptureRecord = CaptureJson;

const get = <T>(url: string) => fetchJson<T>(url);
const quiet = { revalidateOnFocus: false };

export const membersKey = "/api/team/members";
export const invitationsKey = "/api/team/invitations";
export const auditKey = "/api/team/audit";
export const partsKey = "/api/parts";
export const capturesKey = "/api/captures";
export const captureKey = (id: string) => `/api/captures/${encodeURIComponent(id)}`;
export const runLinksKey = (runId: string) => `/api/runs/${encodeURIComponent(runId)}/links`;
export const commentsKey = (runId: string) => `/api/runs/${encodeURIComponent(runId)}/comments`;
export const signoffsKey = (runId: string) => `/api/runs/${encodeURIComponent(runId)}/signoffs`;

export const useMembers = () => useSWR<ListOf<MemberJson>>(membersKey, get, quiet);
export const useInvitations = (enabled = true) =>
  useSWR<ListOf<InvitationJson>>(enabled ? invitationsKey : null, get, quiet);
export const useAudit = (enabled = true) => useSWR<ListOf<AuditEntryJson>>(enabled ? auditKey : null, get, quiet);
export const useParts = () => useSWR<ListOf<PartProfileRecord>>(partsKey, get, quiet);
export const useCaptures = () => useSWR<ListOf<CaptureSummary>>(capturesKey, get, quiet);
export const useCapture = (id: string | null) => useSWR<CaptureRecord>(id ? captureKey(id) : null, get, quiet);
export const useRunLinks = (runId: string | null) =>
  useSWR<ListOf<RunLinkJson>>(runId ? runLinksKey(runId) : null, get, quiet);
export const useComments = (runId: string | null) =>
  useSWR<ListOf<CommentJson>>(runId ? commentsKey(runId) : null, get);
export const useSignoffs = (runId: string | null) =>
  useSWR<ListOf<SignoffJson>>(runId ? signoffsKey(runId) : null, get);
