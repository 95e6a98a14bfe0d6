// Runs: GET /api/runs?scenarioId=, /api/runs/:id and its study.
import useSWR from "swr";
import type { ListOf, RunJson, RunSummaryJson } from "@/lib/schemas/responses";
import { enc, get, quiet } from "./swr";

/** A run list item: no snapshot, samples or events. */
export type RunSummary = RunSummaryJson;

/** A whole run (GET /api/runs/:id), as the run, report, compare and share views take it. */
export type RunRecord = RunJson;

export const runsKey = (scenarioId: string) => `/api/runs?scenarioId=${enc(scenarioId)}`;
export const runKey = (id: string) => `/api/runs/${enc(id)}`;

export const useRuns = (scenarioId: string | null | undefined) =>
  useSWR<ListOf<RunSummary>>(scenarioId ? runsKey(scenarioId) : null, get, quiet);
export const useRun = (id: string | null | undefined) => useSWR<RunJson>(id ? runKey(id) : null, get, quiet);
