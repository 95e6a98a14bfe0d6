// Scenarios and their versions: GET /api/scenarios?boardId=, /api/scenarios/:id, …/versions[/:version].
import useSWR from "swr";
import type {
  LatestDecisionJson,
  ListOf,
  ScenarioJson,
  ScenarioSummaryJson,
  ScenarioVersionDocJson,
  ScenarioVersionJson,
} from "@/lib/schemas/responses";
import { enc, get, quiet } from "./swr";

export type ScenarioRecord = ScenarioJson;
/** A scenario list item: waveform arrays left out (`lean: true`). */
export type ScenarioSummary = ScenarioSummaryJson;
/** Latest review decision on any run of a scenario. */
export type LatestDecision = LatestDecisionJson;

export const scenariosKey = (boardId: string) => `/api/scenarios?boardId=${enc(boardId)}`;
export const scenarioKey = (id: string) => `/api/scenarios/${enc(id)}`;
export const scenarioVersionsKey = (id: string) => `${scenarioKey(id)}/versions`;
export const scenarioVersionKey = (id: string, version: number) => `${scenarioVersionsKey(id)}/${version}`;

export const useScenarios = (boardId: string | null | undefined) =>
  useSWR<ListOf<ScenarioSummary>>(boardId ? scenariosKey(boardId) : null, get, quiet);
export const useScenario = (id: string | null | undefined) =>
  useSWR<ScenarioRecord>(id ? scenarioKey(id) : null, get, quiet);
export const useScenarioVersions = (id: string | null | undefined) =>
  useSWR<ListOf<ScenarioVersionJson>>(id ? scenarioVersionsKey(id) : null, get, quiet);
export const useScenarioVersion = (id: string | null | undefined, version: number | null | undefined) =>
  useSWR<ScenarioVersionDocJson>(id && version ? scenarioVersionKey(id, version) : null, get, quiet);
