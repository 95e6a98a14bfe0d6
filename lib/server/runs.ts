import "server-only";
// Runs: the server re-runs the stored scenario with lib/sim (the same deterministic core as the
// browser) and stores the snapshot, events, metrics and decimated samples. Runs are immutable.
import { checkRunBounds, simulate, toResultJson, SimFailed, type SimResult } from "@/lib/sim";
import { scenarioSchema, describeIssues, type Scenario } from "@/lib/schemas/scenario";
import type { ResultJson } from "@/lib/sim/types";
import { getModels, getSequelize, type RunRow } from "@/models";
import { recordAudit } from "./audit";
import { badRequest, notFound } from "./errors";
import { isId, iso, person, type PersonJson } from "./ids";
import { getScenarioDataOrThrow } from "./scenarios";

/** Stored waveforms are thinned to at most this many points (the plots decimate anyway). */
export const MAX_STORED_POINTS = 4000;

export interface StoredResultJson extends ResultJson {
  /** Present when the samples were thinned: how many points the run produced and the method. */
  decimation?: { from: number; kept: number; method: "min-max" };
}

export interface RunJson {
  id: string;
  scenarioId: string;
  scenarioVersion: number | null;
  label: string;
  createdAt: string;
  createdBy: PersonJson;
  scenario: Scenario;
  result: StoredResultJson;
  study: unknown | null;
}

/** List item: no scenario snapshot, samples or events (open the run for those). */
export interface RunSummaryJson extends Omit<RunJson, "scenario" | "result"> {
  scenarioName: string | null;
  result: Omit<StoredResultJson, "samples" | "events"> & { eventCount: number };
}

/**
 * Indices to keep: both ends, then in each of ⌊(max − 2)/2⌋ equal buckets the samples where the
 * output is lowest and highest (in time order), so narrow pulses and chatter stay visible.
 */
export function decimationIndices(output: ArrayLike<number>, max = MAX_STORED_POINTS): number[] {
  const n = output.length;
  if (n <= max) return Array.from({ length: n }, (_, i) => i);
  const keep: number[] = [0];
  const buckets = Math.floor((max - 2) / 2);
  const inner = n - 2;
  for (let b = 0; b < buckets; b++) {
    const from = 1 + Math.floor((b * inner) / buckets);
    const to = 1 + Math.floor(((b + 1) * inner) / buckets);
    if (to <= from) continue;
    let lo = from;
    let hi = from;
    for (let i = from + 1; i < to; i++) {
      if (output[i] < output[lo]) lo = i;
      if (output[i] > output[hi]) hi = i;
    }
    if (lo === hi) keep.push(lo);
    else keep.push(Math.min(lo, hi), Math.max(lo, hi));
  }
  keep.push(n - 1);
  return keep;
}

function storedResult(result: SimResult): StoredResultJson {
  const n = result.t.length;
  if (n <= MAX_STORED_POINTS) return toResultJson(result);
  const idx = decimationIndices(result.output);
  const pick = (a: Float64Array) => Float64Array.from(idx, (i) => a[i]);
  const thinned: SimResult = { ...result, t: pick(result.t), input: pick(result.input), output: pick(result.output) };
  return { ...toResultJson(thinned), decimation: { from: n, kept: idx.length, method: "min-max" } };
}

/** Simulates a stored scenario, refusing (400) what is malformed or past the server's bounds. */
export function runOnServer(data: unknown): { scenario: Scenario; result: StoredResultJson } {
  const parsed = scenarioSchema.safeParse(data);
  if (!parsed.success) {
    const lines = describeIssues(parsed.error);
    throw badRequest(`The stored scenario is not valid: ${lines.join("; ")}`, parsed.error.issues.map((i) => ({ path: ["scenario", ...i.path.map(String)], message: i.message })));
  }
  const scenario = parsed.data;
  const reasons = checkRunBounds(scenario);
  if (reasons.length) {
    throw badRequest(`This run is too large for the server: ${reasons.join("; ")}`, reasons.map((message) => ({ path: ["scenario"], message })));
  }
  try {
    return { scenario, result: storedResult(simulate(scenario)) };
  } catch (err) {
    if (err instanceof SimFailed) throw badRequest(`The simulation could not finish: ${err.message}`);
    throw err;
  }
}

type Named = { name: string } | null | undefined;

function runJson(row: RunRow): RunJson {
  return {
    id: row.id,
    scenarioId: row.scenarioId as string,
    scenarioVersion: row.scenarioVersion ?? null,
    label: row.label,
    createdAt: iso(row.createdAt)!,
    createdBy: person(row.createdBy, (row as unknown as { author?: Named }).author),
    scenario: row.scenario as Scenario,
    result: row.result as StoredResultJson,
    study: row.study ?? null,
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
  const { scenario, result } = runOnServer(current.scenario);
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

export async function listRuns({ scenarioId, teamId }: { scenarioId: string; teamId: string }): Promise<RunSummaryJson[]> {
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

export async function deleteRun({ id, teamId, actorId }: { id: string; teamId: string; actorId: string }): Promise<void> {
  await getSequelize().transaction(async (transaction) => {
    const row = isId(id) ? await getModels().Run.findOne({ where: { id, teamId }, attributes: ["id", "label"], transaction }) : null;
    if (!row) throw notFound("No such run in your team.");
    await row.destroy({ transaction });
    await recordAudit({ teamId, actorId, action: "run.deleted", targetType: "run", targetId: id, details: { label: row.label } }, transaction);
  });
}
