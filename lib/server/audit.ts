import "server-only";
// Audit log of membership, link, sign-off and delete actions (readable by the owner).
import type { Model, Transaction } from "sequelize";
import { Op } from "sequelize";
import { getModels, getSequelize } from "@/models";
import type { AuditJson } from "@/lib/schemas/responses";
import { notFound } from "./errors";
import { isId } from "./ids";
export type { AuditJson };

export interface AuditEntry {
  teamId: string | null;
  actorId: string | null;
  action: string;
  targetType?: string | null;
  targetId?: string | null;
  details?: unknown;
}

export async function recordAudit(entry: AuditEntry, transaction?: Transaction): Promise<void> {
  await getModels().Audit.create(
    {
      teamId: entry.teamId,
      actorId: entry.actorId,
      action: entry.action,
      targetType: entry.targetType ?? null,
      targetId: entry.targetId ?? null,
      details: entry.details ?? null,
    },
    { transaction },
  );
}

/**
 * Deletes one row of a team and records it, in one transaction: `find` reads the row (null when
 * it is not the team's, answered 404 "No such <what> in your team."; a malformed id never
 * reaches it), `details` names it in the
 * audit log so the entry survives the row. Foreign keys cascade to what the row owns.
 */
export async function deleteAudited<R extends Model>({
  find,
  what,
  action,
  targetType,
  id,
  teamId,
  actorId,
  details,
}: {
  find: (transaction: Transaction) => Promise<R | null>;
  what: string;
  action: string;
  targetType: string;
  id: string;
  teamId: string;
  actorId: string;
  details: (row: R) => Record<string, unknown>;
}): Promise<void> {
  await getSequelize().transaction(async (transaction) => {
    const row = isId(id) ? await find(transaction) : null;
    if (!row) throw notFound(`No such ${what} in your team.`);
    await row.destroy({ transaction });
    await recordAudit({ teamId, actorId, action, targetType, targetId: id, details: details(row) }, transaction);
  });
}

export async function listAudit({ teamId, limit = 200 }: { teamId: string; limit?: number }): Promise<AuditJson[]> {
  const { Audit, User } = getModels();
  const rows = await Audit.findAll({
    where: { teamId },
    order: [["createdAt", "DESC"]],
    limit,
    include: [{ model: User, as: "actor", attributes: ["name"] }],
  });
  const names = await targetNames(teamId, rows);
  return rows.map((r) => {
    const actor = r.actor;
    return {
      id: r.id,
      action: r.action,
      actorId: (r.actorId as string | null) ?? null,
      actorName: actor?.name ?? null,
      targetType: r.targetType,
      targetId: r.targetId,
      targetName: (r.targetId && names.get(`${r.targetType}:${r.targetId}`)) || fallbackName(r.details),
      details: r.details ?? null,
      createdAt: new Date(r.createdAt).toISOString(),
    };
  });
}

/** A name recorded in the details when the entry was written (survives deletion of the target). */
function fallbackName(details: unknown): string | null {
  if (!details || typeof details !== "object") return null;
  const d = details as Record<string, unknown>;
  if (typeof d.runLabel === "string")
    return typeof d.scenarioName === "string" ? `run "${d.runLabel}" of ${d.scenarioName}` : `run "${d.runLabel}"`;
  if (typeof d.name === "string" && d.name) return d.name;
  if (typeof d.email === "string") return d.email;
  return null;
}

/** Names of the members and runs the entries point at, looked up in two queries. */
async function targetNames(
  teamId: string,
  rows: { targetType: string | null; targetId: string | null }[],
): Promise<Map<string, string>> {
  const { User, Run, Scenario } = getModels();
  const out = new Map<string, string>();
  const ids = (type: string) => [
    ...new Set(rows.filter((r) => r.targetType === type && r.targetId).map((r) => r.targetId as string)),
  ];
  const userIds = ids("user");
  if (userIds.length) {
    for (const u of await User.findAll({ where: { id: { [Op.in]: userIds } }, attributes: ["id", "name"] }))
      out.set(`user:${u.id}`, u.name);
  }
  const runIds = ids("run");
  if (runIds.length) {
    const runs = await Run.findAll({
      where: { teamId, id: { [Op.in]: runIds } },
      attributes: ["id", "label", "scenarioId"],
    });
    const scenarioIds = [...new Set(runs.map((r) => r.scenarioId as string))];
    const scenarios = scenarioIds.length
      ? await Scenario.findAll({ where: { id: { [Op.in]: scenarioIds } }, attributes: ["id", "name"] })
      : [];
    const scenarioName = new Map(scenarios.map((s) => [s.id, s.name]));
    for (const r of runs) {
      const sName = scenarioName.get(r.scenarioId as string);
      out.set(`run:${r.id}`, sName ? `run "${r.label}" of ${sName}` : `run "${r.label}"`);
    }
  }
  return out;
}
