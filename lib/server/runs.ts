import "server-only";
// Runs: the server re-runs the stored scenario with lib/sim (the same deterministic core as the
// browser) in the simulation worker pool (sim-pool.ts: off the request thread, with a wall-time
// budget and a heap limit) and stores the snapshot, events, metrics and decimated samples.
// Runs are immutable.
import type { Scenario } from "@/lib/schemas/scenario";
import { getModels, type RunRow } from "@/models";
import { deleteAudited } from "./audit";
import { notFound } from "./errors";
import type { RunJson, RunSummaryJson, SavedStudyJson, StoredResultJson } from "@/lib/schemas/responses";
import { isId, iso, person } from "./ids";
import { getScenarioDataOrThrow } from "./scenarios";
import { runBudgetMs, runInPool } from "./sim-pool";

export { MAX_STORED_POINTS } from "./sim-worker";
export type { RunJson, RunSummaryJson, StoredResultJson };

/**
 * Simulates a stored scenario in the worker pool, refusing (400) what is malformed or past the
 * server's bounds and (422) what runs past the budget or the heap limit.
 */
export async function runOnServer(data: unknown): Promise<{ scenario: Scenario; result: StoredResultJson }> {
  const answer = await runInPool({ kind: "run", scenario: data, budgetMs: runBudgetMs() });
  return { scenario: answer.scenario, result: answer.result };
}

function runJson(row: RunRow): RunJson {
  return {
    id: row.id,
    scenarioId: row.scenarioId as string,
    scenarioVersion: row.scenarioVersion ?? null,
    label: row.label,
    createdAt: iso(row.createdAt)!,
    createdBy: person(row.createdBy, row.author),
    scenario: row.scenario as Scenario,
    result: row.result as StoredResultJson,
    study: (row.study as SavedStudyJson | null) ?? null,
  };
}

function summaryJson(row: RunRow): RunSummaryJson {
  const full = runJson(row);
  const { samples: _samples, events, ...rest } = full.result;
  void _samples;
  const { scenario, result: _result, ...head } = full;
  void _result;
  return { ...head, scenarioName: scenario?.name ?? null, result: { ...rest, eventCount: events?.length ?? 0 } };
}

const withAuthor = () => [{ model: getModels().User, as: "author", attributes: ["name"] }];

export async function createRun({
  scenarioId,
  teamId,
  actorId,
  label,
}: {
  scenarioId: string;
  teamId: string;
  actorId: string;
  label?: string;
}): Promise<RunJson> {
  const current = await getScenarioDataOrThrow({ id: scenarioId, teamId });
  const { scenario, result } = await runOnServer(current.scenario);
  const row = await getModels().Run.create({
    teamId,
    scenarioId: current.id,
    scenarioVersion: current.version,
    label: label?.trim() || `${current.name} · version ${current.version}`,
    scenario,
    result,
    study: null,
    createdBy: actorId,
  });
  return getRunOrThrow({ id: row.id, teamId });
}

export async function listRuns({
  scenarioId,
  teamId,
}: {
  scenarioId: string;
  teamId: string;
}): Promise<RunSummaryJson[]> {
  await getScenarioDataOrThrow({ id: scenarioId, teamId });
  const rows = await getModels().Run.findAll({
    where: { scenarioId, teamId },
    order: [["createdAt", "DESC"]],
    include: withAuthor(),
  });
  return rows.map(summaryJson);
}

export async function getRunOrThrow({ id, teamId }: { id: string; teamId: string }): Promise<RunJson> {
  const row = isId(id) ? await getModels().Run.findOne({ where: { id, teamId }, include: withAuthor() }) : null;
  if (!row) throw notFound("No such run in your team.");
  return runJson(row);
}

export async function deleteRun({
  id,
  teamId,
  actorId,
}: {
  id: string;
  teamId: string;
  actorId: string;
}): Promise<void> {
  await deleteAudited({
    id,
    teamId,
    actorId,
    what: "run",
    action: "run.deleted",
    targetType: "run",
    find: (transaction) => getModels().Run.findOne({ where: { id, teamId }, attributes: ["id", "label"], transaction }),
    details: (row) => ({ label: row.label }),
  });
}
