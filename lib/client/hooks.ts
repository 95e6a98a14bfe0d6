// One SWR hook per resource (DEVELOPERS.md, API conventions). Keys are the API URLs, so after a write
// `mutate(url)` (exact key, swr#746) or the hook's bound `mutate` refreshes the view.
import useSWR, { type SWRConfiguration } from "swr";
import type { Scenario } from "@/lib/schemas/scenario";
import type { ResultJson } from "@/lib/sim/types";
import { fetchJson } from "./fetcher";

/** A user as the API may return it: an id, or an object with a name. */
export type PersonRef = string | { id: string; name?: string | null; email?: string | null } | null;

export interface Board {
  id: string;
  name: string;
  description?: string;
  createdAt?: string;
  updatedAt?: string;
  scenarioCount?: number;
}

/** Latest review decision on any run of a scenario (added by the team side). */
export interface LatestDecision {
  decision: "approved" | "changes-requested" | "changes_requested" | string;
  at?: string;
  by?: PersonRef;
  runId?: string;
}

export interface ScenarioRecord {
  id: string;
  boardId: string;
  name: string;
  version: number;
  scenario: Scenario;
  updatedAt: string;
  updatedBy: PersonRef;
  latestDecision?: LatestDecision | null;
}

export interface RunRecord {
  id: string;
  scenarioId: string;
  label?: string | null;
  createdAt: string;
  createdBy: PersonRef;
  scenario: Scenario;
  result: ResultJson;
  study?: unknown;
}

export interface ListResponse<T> {
  items: T[];
}

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
  return useSWR<ListResponse<Board>>(boardsKey, fetcher, listConfig);
}

export function useBoard(id: string | null | undefined) {
  return useSWR<Board>(id ? boardKey(id) : null, fetcher);
}

export function useScenarios(boardId: string | null | undefined) {
  return useSWR<ListResponse<ScenarioRecord>>(boardId ? scenariosKey(boardId) : null, fetcher, listConfig);
}

export function useScenario(id: string | null | undefined) {
  return useSWR<ScenarioRecord>(id ? scenarioKey(id) : null, fetcher, { revalidateOnFocus: false });
}

export function useRuns(scenarioId: string | null | undefined) {
  return useSWR<ListResponse<RunRecord>>(scenarioId ? runsKey(scenarioId) : null, fetcher, listConfig);
}

export function useRun(id: string | null | undefined) {
  return useSWR<RunRecord>(id ? runKey(id) : null, fetcher, { revalidateOnFocus: false });
}

/** Display name of a PersonRef ("—" when unknown). */
export function personName(p: PersonRef | undefined): string {
  if (!p) return "—";
  if (typeof p === "string") return p;
  return p.name || p.email || p.id;
}
