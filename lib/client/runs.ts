// Runs: GET /api/runs?scenarioId=, /api/runs/:id and its study.
import useSWR from "swr";
import type { ListOf, RunJson, RunSummaryJson } from "@/lib/schemas/responses";
import { enc, get, quiet } from "./swr";

/** A run list item: no snapshot, samples or events. */
export type RunSummary = RunSummaryJson;

// Transitional, until app/share/[token]/page.tsx builds a SharedRunJson-based view and
// components/review/compare-view.tsx types its run lists with RunSummary (see lib/schemas/README.md
// § Responses): the old names are looser than the schema, never different from it.
/** A run as the views take it; the share page builds one without a scenario version. */
export type RunRecord = Omit<RunJson, "scenarioVersion"> & Partial<Pick<RunJson, "scenarioVersion">>;
/** A run list item with the summary-only fields optional, so a cast to RunRecord still compiles. */
export type RunListItem = Omit<RunSummary, "scenarioName" | "result"> &
  Partial<Pick<RunSummary, "scenarioName">> & {
    result: Omit<RunSummary["result"], "eventCount"> & Partial<Pick<RunSummary["result"], "eventCount">>;
  };

export const runsKey = (scenarioId: string) => `/api/runs?scenarioId=${enc(scenarioId)}`;
export const runKey = (id: string) => `/api/runs/${enc(id)}`;

export const useRuns = (scenarioId: string | null | undefined) =>
  useSWR<ListOf<RunListItem>>(scenarioId ? runsKey(scenarioId) : null, get, quiet);
export const useRun = (id: string | null | undefined) => useSWR<RunJson>(id ? runKey(id) : null, get, quiet);
