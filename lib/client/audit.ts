// The team's audit log: GET /api/team/audit (owner).
import useSWR from "swr";
import type { AuditJson, ListOf } from "@/lib/schemas/responses";
import { get, quiet } from "./swr";

export type AuditEntryJson = AuditJson;

export const auditKey = "/api/team/audit";

export const useAudit = (enabled = true) => useSWR<ListOf<AuditJson>>(enabled ? auditKey : null, get, quiet);
