// One SWR hook per resource (DEVELOPERS.md, API conventions). Keys are the API URLs, so after a write
// `mutate(url)` (exact key, swr#746) or the hook's bound `mutate` refreshes the view.
import useSWR, { type SWRConfiguration } from "swr";
import type {
  BoardJson,
  LatestDecisionJson,
  ListOf,
  PersonJson,
  RunJson,
  RunSummaryJson,
  ScenarioJson,
  ScenarioSummaryJson,
} from "@/lib/schemas/responses";
import { fetchJson } from "./fetcher";

// Response types come from the schemas (lib/schemas/responses.ts); the names the UI knows stay as aliases.
export type { ListOf };
/** A user named on a stored object, or null. */
export type PersonRef = PersonJson;
export type Board = BoardJson;
/** Latest review decision on any run of a scenario. */
export type LatestDecision = LatestDecisionJson;
export type ScenarioRecord = ScenarioJson;
/** A scenario list item: waveform arrays left out (`lean: true`). */
export type ScenarioSummary = ScenarioSummaryJson;
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
export type ListResponse<T> = ListOf<T>;

const fetcher = <T>(url: string) => fetchJson<T>(url);

// Lists stay quiet on focus: engineers switch windows a lot and a reflowing table is noise.
const listConfig: SWRConfiguration = { revalidateOnFocus: false };

export const boardsKey = "/api/boards";
export const boardKey = (id: string) => `/api/boards/${encodeURIComponent(id)}`;
export const scenariosKey = (boardId: string) => `/api/scenarios?boardId=${encodeURIComponent(boardId)}`;
export const scenarioKey = (id: string) => `/api/scenarios/${encodeURIComponent(id)}`;
export const runsKey = (scenarioId: string) => `/api/runs?scenarioId=${encodeURIComponent(scenarioId)}`;
export const runKey = (id: string) => `/api/runs/${encodeURIComponent(id)}`;

export function useBoards() {
  return useSWR<ListOf<Board>>(boardsKey, fetcher, listConfig);
}

export function useBoard(id: string | null | undefined) {
  return useSWR<Board>(id ? boardKey(id) : null, fetcher);
}

export function useScenarios(boardId: string | null | undefined) {
  return useSWR<ListOf<ScenarioSummary>>(boardId ? scenariosKey(boardId) : null, fetcher, listConfig);
}

export function useScenario(id: string | null | undefined) {
  return useSWR<ScenarioRecord>(id ? scenarioKey(id) : null, fetcher, { revalidateOnFocus: false });
}

export function useRuns(scenarioId: string | null | undefined) {
  return useSWR<ListOf<RunListItem>>(scenarioId ? runsKey(scenarioId) : null, fetcher, listConfig);
}

export function useRun(id: string | null | undefined) {
  return useSWR<RunJson>(id ? runKey(id) : null, fetcher, { revalidateOnFocus: false });
}

/** Display name of a PersonRef ("—" when unknown). */
export function personName(p: PersonRef | undefined): string {
  if (!p) return "—";
  return p.name || p.id;
}
