import "server-only";
// Audit log of membership, link, sign-off and delete actions (readable by the owner).
import type { Transaction } from "sequelize";
import { getModels } from "@/models";

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

export interface AuditJson {
  id: string;
  action: string;
  actorId: string | null;
  actorName: string | null;
  targetType: string | null;
  targetId: string | null;
  details: unknown;
  createdAt: string;
}

export async function listAudit({ teamId, limit = 200 }: { teamId: string; limit?: number }): Promise<AuditJson[]> {
  const { Audit, User } = getModels();
  const rows = await Audit.findAll({
    where: { teamId },
    order: [["createdAt", "DESC"]],
    limit,
    include: [{ model: User, as: "actor", attributes: ["name"] }],
  });
  return rows.map((r) => {
    const actor = (r as unknown as { actor?: { name: string } | null }).actor;
    return {
      id: r.id,
      action: r.action,
      actorId: (r.actorId as string | null) ?? null,
      actorName: actor?.name ?? null,
      targetType: r.targetType,
      targetId: r.targetId,
      details: r.details ?? null,
      createdAt: new Date(r.createdAt).toISOString(),
    };
  });
}
