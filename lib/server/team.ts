import "server-only";
import bcrypt from "bcryptjs";
import { Op, UniqueConstraintError, type Transaction } from "sequelize";
import { getModels } from "@/models";
import { lockRow, withWriteTransaction } from "@/models/transactions";
import { isId } from "@/lib/server/ids";
import { badRequest, conflict, gone, notFound } from "@/lib/server/errors";
import { recordAudit } from "@/lib/server/audit";
import { sendMail, appBaseUrl } from "@/lib/server/mail";
import { bumpSessionGeneration } from "@/lib/auth";
import { hashToken, newToken, plausibleToken } from "@/lib/server/tokens";
import { INVITATION_TTL_HOURS, type RoleName } from "@/lib/schemas/team";
import type {
  InvitationAcceptedJson,
  InvitationCreatedJson,
  InvitationJson,
  InvitationPreviewJson,
  MemberJson,
} from "@/lib/schemas/responses";

// Members, invitations and the audit log of one team. Every function takes the caller's
// teamId and never touches another team's rows (another team's id is a 404).

const iso = (d: Date | string | null | undefined) => (d ? new Date(d).toISOString() : null);

export async function listMembers({ teamId }: { teamId: string }): Promise<MemberJson[]> {
  const { Membership, User } = getModels();
  const rows = await Membership.findAll({
    where: { teamId },
    include: [{ model: User, as: "user", attributes: ["id", "name", "email"] }],
    order: [
      ["createdAt", "ASC"],
      ["id", "ASC"],
    ],
  });
  return rows.map((m) => {
    const user = m.user;
    return {
      id: m.userId as string,
      membershipId: m.id,
      name: user?.name ?? "",
      email: user?.email ?? "",
      role: m.role,
      joinedAt: iso(m.createdAt)!,
    };
  });
}

/**
 * Every transaction that changes a team's memberships or invitations first locks the team's row
 * (FOR UPDATE on PostgreSQL; SQLite's writer lock), so two of them for the same team run one
 * after the other: the owner count read by one is still true when it writes (last-owner rule).
 */
export async function lockTeam(teamId: string, transaction: Transaction) {
  const team = await lockRow(getModels().Team, { id: teamId }, transaction);
  if (!team) throw notFound("Your team no longer exists.");
  return team;
}

async function findMembershipOrThrow(teamId: string, memberId: string, transaction: Transaction) {
  const { Membership } = getModels();
  if (!isId(memberId)) throw notFound("No such member in your team.");
  // The path id is the member's user id (as listed); a membership id is accepted too.
  const m = await Membership.findOne({
    where: { teamId, [Op.or]: [{ userId: memberId }, { id: memberId }] },
    transaction,
  });
  if (!m) throw notFound("No such member in your team.");
  return m;
}

async function ownerCount(teamId: string, transaction: Transaction): Promise<number> {
  return getModels().Membership.count({ where: { teamId, role: "owner" }, transaction });
}

export async function changeMemberRole({
  teamId,
  actorId,
  memberId,
  role,
}: {
  teamId: string;
  actorId: string;
  memberId: string;
  role: RoleName;
}): Promise<MemberJson> {
  await withWriteTransaction(async (transaction) => {
    await lockTeam(teamId, transaction);
    const m = await findMembershipOrThrow(teamId, memberId, transaction);
    const from = m.role;
    if (from === role) return;
    if (from === "owner" && (await ownerCount(teamId, transaction)) <= 1) {
      throw conflict("This is the team's only owner; make another member owner first.");
    }
    m.role = role;
    await m.save({ transaction });
    await bumpSessionGeneration(m.userId as string, transaction); // the member signs in again with the new role
    await recordAudit(
      {
        teamId,
        actorId,
        action: "member.role_changed",
        targetType: "user",
        targetId: m.userId as string,
        details: { from, to: role },
      },
      transaction,
    );
  });
  const members = await listMembers({ teamId });
  const member = members.find((x) => x.id === memberId || x.membershipId === memberId);
  if (!member) throw notFound("No such member in your team.");
  return member;
}

export async function removeMember({
  teamId,
  actorId,
  memberId,
}: {
  teamId: string;
  actorId: string;
  memberId: string;
}): Promise<void> {
  await withWriteTransaction(async (transaction) => {
    await lockTeam(teamId, transaction);
    const m = await findMembershipOrThrow(teamId, memberId, transaction);
    if (m.role === "owner" && (await ownerCount(teamId, transaction)) <= 1) {
      throw conflict("This is the team's only owner; a team cannot be left without an owner.");
    }
    const user = await getModels().User.findByPk(m.userId as string, { attributes: ["email", "name"], transaction });
    await m.destroy({ transaction });
    await bumpSessionGeneration(m.userId as string, transaction); // ends the removed member's sessions
    await recordAudit(
      {
        teamId,
        actorId,
        action: "member.removed",
        targetType: "user",
        targetId: m.userId as string,
        details: { email: user?.email ?? null, name: user?.name ?? null, role: m.role },
      },
      transaction,
    );
  });
}

// ---- Invitations ----

function invitationJson(row: {
  id: string;
  email: string;
  role: RoleName;
  expiresAt: Date;
  createdAt: Date;
  invitedBy?: unknown;
}): InvitationJson {
  return {
    id: row.id,
    email: row.email,
    role: row.role,
    expiresAt: iso(row.expiresAt)!,
    createdAt: iso(row.createdAt)!,
    invitedBy: (row.invitedBy as string | null) ?? null,
  };
}

export async function listPendingInvitations({ teamId }: { teamId: string }): Promise<InvitationJson[]> {
  const rows = await getModels().Invitation.findAll({
    where: { teamId, acceptedAt: null, expiresAt: { [Op.gt]: new Date() } },
    order: [
      ["createdAt", "DESC"],
      ["id", "ASC"],
    ],
  });
  return rows.map(invitationJson);
}

export async function createInvitation({
  teamId,
  actorId,
  actorName,
  email,
  role,
  request,
}: {
  teamId: string;
  actorId: string;
  actorName: string;
  email: string;
  role: RoleName;
  request: Request;
}): Promise<InvitationCreatedJson> {
  const { User, Membership, Invitation, Team } = getModels();
  const { token, tokenHash } = newToken();
  const teamName = (await Team.findByPk(teamId, { attributes: ["name"] }))?.name ?? "your team";
  const expiresAt = new Date(Date.now() + INVITATION_TTL_HOURS * 3_600_000);
  const created = await withWriteTransaction(async (transaction) => {
    await lockTeam(teamId, transaction);
    const user = await User.findOne({ where: { email }, attributes: ["id"], transaction });
    if (user && (await Membership.count({ where: { teamId, userId: user.id }, transaction })) > 0) {
      throw conflict(`${email} is already a member of this team.`);
    }
    // A new invitation replaces any earlier pending one for the same address.
    await Invitation.destroy({ where: { teamId, email, acceptedAt: null }, transaction });
    const row = await Invitation.create(
      { teamId, email, role, tokenHash, expiresAt, invitedBy: actorId },
      { transaction },
    );
    await recordAudit(
      {
        teamId,
        actorId,
        action: "invitation.created",
        targetType: "invitation",
        targetId: row.id,
        details: { email, role },
      },
      transaction,
    );
    return row;
  });
  const link = `${appBaseUrl(request)}/invite/${token}`;
  const mail = await sendMail({
    to: email,
    subject: `${actorName} invited you to ${teamName} on Railwise`,
    text: [
      `${actorName} invited you to join the team "${teamName}" on Railwise as ${role}.`,
      "",
      "Open this link to choose your name and password and join the team:",
      link,
      "",
      `The link works once and expires on ${expiresAt.toUTCString()}.`,
      "If you did not expect this invitation, ignore this mail.",
    ].join("\n"),
  });
  return { ...invitationJson(created), mailSent: mail.sent };
}

export async function revokeInvitation({
  teamId,
  actorId,
  invitationId,
}: {
  teamId: string;
  actorId: string;
  invitationId: string;
}): Promise<void> {
  await withWriteTransaction(async (transaction) => {
    if (!isId(invitationId)) throw notFound("No such pending invitation.");
    await lockTeam(teamId, transaction);
    const row = await getModels().Invitation.findOne({
      where: { id: invitationId, teamId, acceptedAt: null },
      transaction,
    });
    if (!row) throw notFound("No such pending invitation.");
    await row.destroy({ transaction });
    await recordAudit(
      {
        teamId,
        actorId,
        action: "invitation.revoked",
        targetType: "invitation",
        targetId: row.id,
        details: { email: row.email, role: row.role },
      },
      transaction,
    );
  });
}

async function usableInvitation(token: string, transaction?: Transaction) {
  if (!plausibleToken(token)) throw notFound("This invitation link is not valid.");
  const where = { tokenHash: hashToken(token) };
  // Inside the accepting transaction the row is locked, so a second accept waits and then
  // sees acceptedAt set (single use on PostgreSQL too).
  const row = transaction
    ? await lockRow(getModels().Invitation, where, transaction)
    : await getModels().Invitation.findOne({ where });
  if (!row) throw notFound("This invitation link is not valid.");
  if (row.acceptedAt) throw gone("This invitation has already been used.");
  if (new Date(row.expiresAt).getTime() <= Date.now())
    throw gone("This invitation has expired; ask the team owner for a new one.");
  return row;
}

export async function previewInvitation({ token }: { token: string }): Promise<InvitationPreviewJson> {
  const row = await usableInvitation(token);
  const { Team, User } = getModels();
  const team = await Team.findByPk(row.teamId as string, { attributes: ["name"] });
  const existing = await User.count({ where: { email: row.email } });
  return {
    email: row.email,
    role: row.role,
    teamName: team?.name ?? "",
    expiresAt: iso(row.expiresAt)!,
    existingAccount: existing > 0,
  };
}

/**
 * Accept: create the account (or, for an existing account, check its password) and join the
 * team with the invited role. Single use: the row is marked accepted in the same transaction,
 * so two concurrent accepts cannot both succeed.
 */
export async function acceptInvitation({
  token,
  name,
  password,
}: {
  token: string;
  name: string;
  password: string;
}): Promise<InvitationAcceptedJson> {
  const { User, Membership } = getModels();
  // Refuse bad tokens before spending bcrypt time; hash outside the transaction (the SQLite
  // writer lock is shared by every request). The check is repeated inside for single use.
  await usableInvitation(token);
  const passwordHash = await bcrypt.hash(password, 10);
  return withWriteTransaction(async (transaction) => {
    const invitation = await usableInvitation(token, transaction);
    await lockTeam(invitation.teamId as string, transaction);
    let user = await User.findOne({ where: { email: invitation.email }, transaction });
    if (user) {
      if (!(await bcrypt.compare(password, user.passwordHash))) {
        throw badRequest("An account with this e-mail already exists; enter its current password to join.", [
          { path: ["password"], message: "does not match the existing account's password" },
        ]);
      }
      if (
        (await Membership.count({ where: { teamId: invitation.teamId as string, userId: user.id }, transaction })) > 0
      ) {
        throw conflict("You are already a member of this team.");
      }
    } else {
      try {
        user = await User.create({ email: invitation.email, name, passwordHash }, { transaction });
      } catch (err) {
        // Another team's invitation to the same address was accepted at the same moment.
        if (err instanceof UniqueConstraintError) {
          throw conflict(
            `An account for ${invitation.email} was created by another invitation just now; open the link again and enter that account's password.`,
          );
        }
        throw err;
      }
    }
    await Membership.create(
      { teamId: invitation.teamId as string, userId: user.id, role: invitation.role },
      { transaction },
    );
    invitation.acceptedAt = new Date();
    await invitation.save({ transaction });
    await recordAudit(
      {
        teamId: invitation.teamId as string,
        actorId: user.id,
        action: "member.joined",
        targetType: "user",
        targetId: user.id,
        details: { email: invitation.email, role: invitation.role, invitationId: invitation.id },
      },
      transaction,
    );
    return { email: invitation.email, role: invitation.role, userId: user.id };
  });
}
