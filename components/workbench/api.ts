// The workbench's calls to the route handlers, in one place.
import { fetchJson, sendJson } from "@/lib/client/fetcher";
import { runsKey, scenarioKey, type PersonRef, type RunRecord, type ScenarioRecord } from "@/lib/client/hooks";
import type { Scenario } from "@/lib/schemas/scenario";

export interface VersionRecord {
  version: number;
  name?: string;
  scenario?: Scenario;
  note?: string | null;
  createdAt: string;
  author?: PersonRef;
  updatedBy?: PersonRef;
  createdBy?: PersonRef;
}

export const versionsKey = (id: string) => `${scenarioKey(id)}/versions`;
export const versionKey = (id: string, v: number) => `${versionsKey(id)}/${v}`;

/** PUT the edited scenario; the server stores it as a new version (409 if someone saved first). */
export function saveScenario(
  id: string,
  body: { scenario: Scenario; name?: string; baseVersion: number; note?: string },
) {
  return sendJson<ScenarioRecord>(scenarioKey(id), "PUT", body);
}

export function fetchVersion(id: string, v: number) {
  return fetchJson<VersionRecord>(versionKey(id, v));
}

export function restoreVersion(id: string, v: number) {
  return sendJson<ScenarioRecord>(`${versionKey(id, v)}/restore`, "POST", {});
}

/** POST /api/runs — the server re-runs the saved scenario and stores the result. */
export function saveRun(scenarioId: string, label?: string) {
  return sendJson<RunRecord>("/api/runs", "POST", label ? { scenarioId, label } : { scenarioId });
}

export { runsKey, scenarioKey };
