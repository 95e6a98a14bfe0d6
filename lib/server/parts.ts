import "server-only";
import { UniqueConstraintError } from "sequelize";
import type { Transaction } from "sequelize";
import { getModels } from "@/models";
import { byText, withWriteTransaction } from "@/models/transactions";
import { lockTeam } from "@/lib/server/team";
import { isId } from "@/lib/server/ids";
import { conflict, notFound } from "@/lib/server/errors";
import { deleteAudited, recordAudit } from "@/lib/server/audit";
import type { PartProfileInput } from "@/lib/schemas/part";
import type { OpAmp } from "@/lib/schemas/scenario";
import type { PartProfileJson } from "@/lib/schemas/responses";
export type { PartProfileJson };

// Team part library: named op-amp parameter sets (the scenario's `opamp` object).

type PartRow = { id: string; name: string; params: unknown; createdBy: unknown; createdAt: Date; updatedAt: Date };

function partJson(row: PartRow): PartProfileJson {
  return {
    id: row.id,
    name: row.name,
    opamp: row.params as OpAmp,
    createdBy: (row.createdBy as string | null) ?? null,
    createdAt: new Date(row.createdAt).toISOString(),
    updatedAt: new Date(row.updatedAt).toISOString(),
  };
}

const duplicate = (name: string) => conflict(`A part profile named "${name}" already exists in your team.`);

/** Names compare without regard to case, so "Fast comparator" and "fast comparator" do not both exist. */
async function nameTaken(teamId: string, name: string, transaction: Transaction, exceptId?: string): Promise<boolean> {
  const rows = await getModels().PartProfile.findAll({ where: { teamId }, attributes: ["id", "name"], transaction });
  return rows.some((r) => r.name.toLowerCase() === name.toLowerCase() && r.id !== exceptId);
}

export async function listParts({ teamId }: { teamId: string }): Promise<PartProfileJson[]> {
  const rows = await getModels().PartProfile.findAll({
    where: { teamId },
    order: [byText("part_profiles", "name"), ["id", "ASC"]],
  });
  return rows.map(partJson);
}

export async function getPartOrThrow({ id, teamId }: { id: string; teamId: string }): Promise<PartProfileJson> {
  const row = isId(id) ? await getModels().PartProfile.findOne({ where: { id, teamId } }) : null;
  if (!row) throw notFound("No such part profile in your team.");
  return partJson(row);
}

export async function createPart({
  teamId,
  actorId,
  part,
}: {
  teamId: string;
  actorId: string;
  part: PartProfileInput;
}): Promise<PartProfileJson> {
  try {
    // The team row is locked so the case-insensitive name check holds until the insert.
    const row = await withWriteTransaction(async (transaction) => {
      await lockTeam(teamId, transaction);
      if (await nameTaken(teamId, part.name, transaction)) throw duplicate(part.name);
      return getModels().PartProfile.create(
        { teamId, name: part.name, params: part.opamp, createdBy: actorId },
        { transaction },
      );
    });
    return partJson(row);
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw duplicate(part.name);
    throw err;
  }
}

export async function updatePart({
  id,
  teamId,
  part,
}: {
  id: string;
  teamId: string;
  part: PartProfileInput;
}): Promise<PartProfileJson> {
  try {
    const row = await withWriteTransaction(async (transaction) => {
      await lockTeam(teamId, transaction);
      const found = isId(id) ? await getModels().PartProfile.findOne({ where: { id, teamId }, transaction }) : null;
      if (!found) throw notFound("No such part profile in your team.");
      if (await nameTaken(teamId, part.name, transaction, id)) throw duplicate(part.name);
      found.name = part.name;
      found.params = part.opamp;
      return found.save({ transaction });
    });
    return partJson(row);
  } catch (err) {
    if (err instanceof UniqueConstraintError) throw duplicate(part.name);
    throw err;
  }
}

export async function deletePart({
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
    what: "part profile",
    action: "part.deleted",
    targetType: "part_profile",
    find: (transaction) => getModels().PartProfile.findOne({ where: { id, teamId }, transaction }),
    details: (row) => ({ name: row.name }),
  });
}

/** All or nothing: a name already in the library refuses the whole file (409, names listed). */
export async function importParts({
  teamId,
  actorId,
  parts,
}: {
  teamId: string;
  actorId: string;
  parts: PartProfileInput[];
}): Promise<PartProfileJson[]> {
  const { PartProfile } = getModels();
  return withWriteTransaction(async (transaction) => {
    await lockTeam(teamId, transaction);
    const existing = await PartProfile.findAll({ where: { teamId }, attributes: ["name"], transaction });
    const taken = new Set(existing.map((r) => r.name.toLowerCase()));
    const clashes = parts.filter((p) => taken.has(p.name.toLowerCase())).map((p) => p.name);
    if (clashes.length) throw conflict(`Already in the library: ${clashes.join(", ")}. Nothing was imported.`);
    const rows = await PartProfile.bulkCreate(
      parts.map((p) => ({ teamId, name: p.name, params: p.opamp, createdBy: actorId })),
      { transaction },
    );
    await recordAudit(
      {
        teamId,
        actorId,
        action: "parts.imported",
        targetType: "part_profile",
        targetId: null,
        details: { count: rows.length },
      },
      transaction,
    );
    return rows.map(partJson);
  });
}
