import "server-only";
// Scenarios with version history: every save stores a new scenario_versions row and moves the
// scenario's current data forward; a restore is a save of an old version's data.
import type { Transaction } from "sequelize";
import { getModels, getSequelize } from "@/models";
import { lockRow, withWriteTransaction } from "@/models/transactions";
import { jsonColumn, selectPrepared } from "@/models/prepared";
import type { Scenario } from "@/lib/schemas/scenario";
import type { ScenarioCreate, ScenarioUpdate } from "@/lib/schemas/api";
import { deleteAudited } from "./audit";
import { getBoardRowOrThrow } from "./boards";
import { conflict, notFound } from "./errors";
import type {
  LatestDecisionJson,
  LeanScenario,
  ScenarioJson,
  ScenarioSummaryJson,
  ScenarioVersionDocJson,
  ScenarioVersionJson,
} from "@/lib/schemas/responses";
import { isId, iso, person } from "./ids";
import { latestDecisionsByScenario } from "./review";

export type { ScenarioJson, ScenarioSummaryJson, ScenarioVersionDocJson, ScenarioVersionJson };

/** A scenario row as the model or the list query reads it; `updaterName` is the updater's name. */
interface ScenarioFields {
  id: string;
  boardId: string | null;
  name: string;
  version: number | string;
  data: unknown;
  createdAt: Date | string;
  updatedAt: Date | string;
  updatedBy: string | null;
  updaterName: string | null | undefined;
}

/** Everything of a scenario's answer but the document itself. */
function recordJson(
  row: Omit<ScenarioFields, "data">,
  latest: LatestDecisionJson | null,
): Omit<ScenarioJson, "scenario"> {
  return {
    id: row.id,
    boardId: row.boardId as string,
    name: row.name,
    version: Number(row.version),
    createdAt: iso(row.createdAt)!,
    updatedAt: iso(row.updatedAt)!,
    updatedBy: person(row.updatedBy, { name: row.updaterName }),
    latestDecision: latest,
  };
}

function scenarioJson(row: ScenarioFields, latest: LatestDecisionJson | null): ScenarioJson {
  return { ...recordJson(row, latest), scenario: jsonColumn(row.data) as Scenario };
}

/** The model row in the shape scenarioJson takes. */
const modelFields = (row: import("@/models").ScenarioRow): ScenarioFields => ({
  id: row.id,
  boardId: row.boardId,
  name: row.name,
  version: row.version,
  data: row.data,
  createdAt: row.createdAt,
  updatedAt: row.updatedAt,
  updatedBy: row.updatedBy,
  updaterName: row.updater?.name,
});

const withUpdater = () => [{ model: getModels().User, as: "updater", attributes: ["name"] }];

/**
 * A board's scenarios as list items: each scenario without its waveform arrays (a pwl's points,
 * a capture's samples), which can be megabytes; each such component keeps its kind and says how
 * many points it has (`pointCount`), and `lean: true` marks the item. GET /api/scenarios/:id has
 * the whole document.
 */
export async function listScenarios({
  boardId,
  teamId,
}: {
  boardId: string;
  teamId: string;
}): Promise<ScenarioSummaryJson[]> {
  if (!isId(boardId)) throw notFound("No such board in your team.");
  // One query, prepared once (models/prepared.ts), names in code-point order on both databases.
  const sequelize = getSequelize();
  const collate = sequelize.getDialect() === "postgres" ? ' COLLATE "C"' : "";
  // The stored list form (scenarios.summary, lib/schemas/lean-scenario.ts), never the document.
  const rows = await selectPrepared<Omit<ScenarioFields, "data"> & { summary: unknown }>(
    sequelize,
    "railwise_list_scenarios",
    `SELECT s."id", s."boardId", s."name", s."version", s."summary",
            s."createdAt", s."updatedAt", s."updatedBy", u."name" AS "updaterName"
       FROM "scenarios" s
       LEFT JOIN "users" u ON u."id" = s."updatedBy"
      WHERE s."boardId" = $1 AND s."teamId" = $2
      ORDER BY s."name"${collate} ASC, s."id" ASC`,
    [boardId, teamId],
  );
  // Rows of this team prove the board is the team's; only an empty answer needs the check (404).
  if (rows.length === 0) await getBoardRowOrThrow({ id: boardId, teamId });
  const decisions = await latestDecisionsByScenario({ teamId, scenarioIds: rows.map((r) => r.id) });
  return rows.map((r) => ({
    ...recordJson(r, decisions.get(r.id) ?? null),
    scenario: jsonColumn(r.summary) as LeanScenario,
    lean: true,
  }));
}

async function scenarioRowOrThrow({
  id,
  teamId,
  transaction,
}: {
  id: string;
  teamId: string;
  transaction?: Transaction;
}) {
  const row = isId(id)
    ? await getModels().Scenario.findOne({ where: { id, teamId }, include: withUpdater(), transaction })
    : null;
  if (!row) throw notFound("No such scenario in your team.");
  return row;
}

export async function getScenarioOrThrow({ id, teamId }: { id: string; teamId: string }): Promise<ScenarioJson> {
  const row = await scenarioRowOrThrow({ id, teamId });
  const decisions = await latestDecisionsByScenario({ teamId, scenarioIds: [row.id] });
  return scenarioJson(modelFields(row), decisions.get(row.id) ?? null);
}

/** The scenario's current document, for the server-side run. */
export async function getScenarioDataOrThrow({ id, teamId }: { id: string; teamId: string }) {
  const row = await scenarioRowOrThrow({ id, teamId });
  return { id: row.id, name: row.name, version: row.version, scenario: row.data as Scenario };
}

export async function createScenario({
  teamId,
  actorId,
  input,
}: {
  teamId: string;
  actorId: string;
  input: ScenarioCreate;
}): Promise<ScenarioJson> {
  const board = await getBoardRowOrThrow({ id: input.boardId, teamId });
  const name = input.name ?? input.scenario.name ?? "Untitled scenario";
  const data: Scenario = { ...input.scenario, name };
  const id = await getSequelize().transaction(async (transaction) => {
    const { Scenario: S, ScenarioVersion } = getModels();
    const row = await S.create(
      { teamId, boardId: board.id, name, version: 1, data, updatedBy: actorId },
      { transaction },
    );
    await ScenarioVersion.create(
      { scenarioId: row.id, version: 1, name, data, authorId: actorId, note: null },
      { transaction },
    );
    return row.id;
  });
  return getScenarioOrThrow({ id, teamId });
}

async function saveVersion({
  id,
  teamId,
  actorId,
  name,
  data,
  note,
  baseVersion,
}: {
  id: string;
  teamId: string;
  actorId: string;
  name?: string;
  data?: Scenario;
  note?: string | null;
  baseVersion?: number;
}): Promise<ScenarioJson> {
  // The scenario row is locked for the whole transaction (FOR UPDATE on PostgreSQL; SQLite's
  // writer lock), so concurrent saves line up: each reads the version the previous one wrote.
  // The answer is built from the row as written here, never re-read after another save.
  const { Scenario: S, ScenarioVersion, User } = getModels();
  const written = await withWriteTransaction(async (transaction) => {
    const row = isId(id) ? await lockRow(S, { id, teamId }, transaction) : null;
    if (!row) throw notFound("No such scenario in your team.");
    if (baseVersion !== undefined && baseVersion !== row.version) {
      throw conflict(
        `The scenario was saved by someone else meanwhile (now version ${row.version}, you edited version ${baseVersion}); reload and apply your change again.`,
      );
    }
    const nextName = name ?? row.name;
    const nextData: Scenario = { ...((data ?? row.data) as Scenario), name: nextName };
    const version = row.version + 1;
    await ScenarioVersion.create(
      { scenarioId: row.id, version, name: nextName, data: nextData, authorId: actorId, note: note ?? null },
      { transaction },
    );
    row.set({ name: nextName, data: nextData, version, updatedBy: actorId });
    row.changed("data", true);
    await row.save({ transaction });
    const updater = await User.findByPk(actorId, { attributes: ["name"], transaction });
    return { row, updater };
  });
  const decisions = await latestDecisionsByScenario({ teamId, scenarioIds: [written.row.id] });
  written.row.updater = written.updater;
  return scenarioJson(modelFields(written.row), decisions.get(written.row.id) ?? null);
}

export function updateScenario({
  id,
  teamId,
  actorId,
  input,
}: {
  id: string;
  teamId: string;
  actorId: string;
  input: ScenarioUpdate;
}) {
  return saveVersion({
    id,
    teamId,
    actorId,
    name: input.name,
    data: input.scenario,
    note: input.note,
    baseVersion: input.baseVersion,
  });
}

export async function deleteScenario({
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
    what: "scenario",
    action: "scenario.deleted",
    targetType: "scenario",
    find: (transaction) => scenarioRowOrThrow({ id, teamId, transaction }),
    details: (row) => ({ name: row.name }),
  });
}

export async function listScenarioVersions({
  id,
  teamId,
}: {
  id: string;
  teamId: string;
}): Promise<ScenarioVersionJson[]> {
  const row = await scenarioRowOrThrow({ id, teamId });
  const { ScenarioVersion, User } = getModels();
  const rows = await ScenarioVersion.findAll({
    where: { scenarioId: row.id },
    order: [["version", "DESC"]],
    attributes: ["version", "name", "note", "createdAt", "authorId"],
    include: [{ model: User, as: "author", attributes: ["name"] }],
  });
  return rows.map((v) => ({
    version: v.version,
    name: v.name,
    note: v.note ?? null,
    createdAt: iso(v.createdAt)!,
    author: person(v.authorId, v.author),
  }));
}

export async function getScenarioVersionOrThrow({
  id,
  teamId,
  version,
}: {
  id: string;
  teamId: string;
  version: number;
}): Promise<ScenarioVersionDocJson> {
  const row = await scenarioRowOrThrow({ id, teamId });
  const { ScenarioVersion, User } = getModels();
  const v = await ScenarioVersion.findOne({
    where: { scenarioId: row.id, version },
    include: [{ model: User, as: "author", attributes: ["name"] }],
  });
  if (!v) throw notFound(`The scenario has no version ${version}.`);
  return {
    version: v.version,
    name: v.name,
    note: v.note ?? null,
    createdAt: iso(v.createdAt)!,
    author: person(v.authorId, v.author),
    scenario: v.data as Scenario,
  };
}

/** Stores the old version's document as a new version (history is never rewritten). */
export async function restoreScenarioVersion({
  id,
  teamId,
  actorId,
  version,
}: {
  id: string;
  teamId: string;
  actorId: string;
  version: number;
}) {
  const old = await getScenarioVersionOrThrow({ id, teamId, version });
  return saveVersion({ id, teamId, actorId, name: old.name, data: old.scenario, note: `restored version ${version}` });
}
