// Compatibility module: the hooks live one module per resource (boards.ts, scenarios.ts, runs.ts,
// people.ts); this file only re-exports the names components imported from here before the split.
export type { ListOf } from "@/lib/schemas/responses";
export { type Board, boardKey, boardsKey, useBoard, useBoards } from "./boards";
export { personName, type PersonRef } from "./people";
export { type RunRecord, type RunSummary, runKey, runsKey, useRun, useRuns } from "./runs";
export {
  type LatestDecision,
  type ScenarioRecord,
  type ScenarioSummary,
  scenarioKey,
  scenariosKey,
  useScenario,
  useScenarios,
} from "./scenarios";

import type { ListOf } from "@/lib/schemas/responses";
/** The old name of ListOf. */
export type ListResponse<T> = ListOf<T>;
