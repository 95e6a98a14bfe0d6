import "server-only";
// Boards: a team's design folders. Every lookup is scoped by teamId (another team's id → 404).
import { getModels, getSequelize } from "@/models";
import { selectPrepared } from "@/models/prepared";
import type { BoardCreate, BoardPatch } from "@/lib/schemas/api";
import type { BoardJson } from "@/lib/schemas/responses";
import { deleteAudited, recordAudit } from "./audit";
import { notFound } from "./errors";
import { isId, iso } from "./ids";

export type { BoardJson };

type BoardRowLike = {
  id: string;
  name: string;
  description: string;
  createdAt: Date | string;
  updatedAt: Date | string;
};

function boardJson(row: BoardRowLike, scenarioCount: number): BoardJson {
  return {
    id: row.id,
    name: row.name,
    description: row.description ?? "",
    scenarioCount,
    createdAt: iso(row.createdAt)!,
    updatedAt: iso(row.updatedAt)!,
  };
}

async function countScenarios(boardIds: string[]): Promise<Map<string, number>> {
  const { Scenario } = getModels();
  if (boardIds.length === 0) return new Map();
  // A grouped count answers one { boardId, count } item per board.
  const rows = await Scenario.count({ where: { boardId: boardIds }, group: ["boardId"] });
  return new Map(rows.map((r) => [String(r.boardId), Number(r.count)]));
}

/**
 * The team's boards with their scenario counts: one query, prepared once (models/prepared.ts),
 * names in code-point order on both databases (COLLATE "C" on PostgreSQL; SQLite compares
 * UTF-8 bytes, the same order).
 */
export async function listBoards({ teamId }: { teamId: string }): Promise<BoardJson[]> {
  const sequelize = getSequelize();
  const collate = sequelize.getDialect() === "postgres" ? ' COLLATE "C"' : "";
  const rows = await selectPrepared<BoardRowLike & { scenarioCount: number | string }>(
    sequelize,
    "railwise_list_boards",
    `SELECT b."id", b."name", b."description", b."createdAt", b."updatedAt",
            (SELECT COUNT(*) FROM "scenarios" s WHERE s."boardId" = b."id") AS "scenarioCount"
       FROM "boards" b
      WHERE b."teamId" = $1
      ORDER BY b."name"${collate} ASC, b."id" ASC`,
    [teamId],
  );
  return rows.map((r) => boardJson(r, Number(r.scenarioCount)));
}

export async function getBoardRowOrThrow({ id, teamId }: { id: string; teamId: string }) {
  const row = isId(id) ? await getModels().Board.findOne({ where: { id, teamId } }) : null;
  if (!row) throw notFound("No such board in your team.");
  return row;
}

export async function getBoardOrThrow({ id, teamId }: { id: string; teamId: string }): Promise<BoardJson> {
  const row = await getBoardRowOrThrow({ id, teamId });
  return boardJson(row, (await countScenarios([row.id])).get(row.id) ?? 0);
}

export async function createBoard({
  teamId,
  actorId,
  input,
}: {
  teamId: string;
  actorId: string;
  input: BoardCreate;
}): Promise<BoardJson> {
  const row = await getSequelize().transaction(async (transaction) => {
    const board = await getModels().Board.create(
      { teamId, name: input.name, description: input.description ?? "", createdBy: actorId },
      { transaction },
    );
    await recordAudit(
      {
        teamId,
        actorId,
        action: "board.created",
        targetType: "board",
        targetId: board.id,
        details: { name: board.name },
      },
      transaction,
    );
    return board;
  });
  return boardJson(row, 0);
}

export async function updateBoard({
  id,
  teamId,
  patch,
}: {
  id: string;
  teamId: string;
  patch: BoardPatch;
}): Promise<BoardJson> {
  const row = await getBoardRowOrThrow({ id, teamId });
  if (patch.name !== undefined) row.name = patch.name;
  if (patch.description !== undefined) row.description = patch.description;
  await row.save();
  return getBoardOrThrow({ id, teamId });
}

/** Deletes the board with its scenarios, versions and runs (foreign keys cascade). */
export async function deleteBoard({
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
    what: "board",
    action: "board.deleted",
    targetType: "board",
    find: (transaction) => getModels().Board.findOne({ where: { id, teamId }, transaction }),
    details: (row) => ({ name: row.name }),
  });
}
