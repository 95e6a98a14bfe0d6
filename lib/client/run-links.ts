// Run links: GET /api/runs/:id/links (owner/designer; never a token).
import useSWR from "swr";
import type { ListOf, RunLinkJson } from "@/lib/schemas/responses";
import { enc, get, quiet } from "./swr";

export const runLinksKey = (runId: string) => `/api/runs/${enc(runId)}/links`;

export const useRunLinks = (runId: string | null) =>
  useSWR<ListOf<RunLinkJson>>(runId ? runLinksKey(runId) : null, get, quiet);
