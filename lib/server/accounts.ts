import "server-only";
// Credential checks and membership look-ups behind sign-in and every handler's role check.
import { compare } from "bcryptjs";
import { getModels } from "@/models";
import type { Role } from "@/lib/schemas/roles";
import { isId } from "./ids";

export interface MemberIdentity {
  userId: string;
  teamId: string;
  teamName: string;
  role: Role;
  name: string;
  email: string;
}

// Compared against when the e-mail is unknown, so a missing account costs the same time
// as a wrong password (no account enumeration by timing). bcrypt of a random string.
const DUMMY_HASH = "$2b$10$pX3NSSVruLu0vG81WTXgIezLf309PllzNJkbkh5mgu7rBJq6nOrIW";

/** The member for an e-mail/password pair, or null. The newest membership is the active team. */
export async function verifyCredentials(email: string, password: string): Promise<MemberIdentity | null> {
  const { User } = getModels();
  // NUL cannot be in a stored address (and PostgreSQL refuses it in a query): strip it first.
  const user = await User.findOne({
    where: {
      email: email.split("\u0000").join("").trim().toLowerCase(),
    },
  });
  const ok = await compare(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !ok) return null;
  return findMembership({ userId: user.id });
}

/** The membership of a user (in a given team, or the newest one), with team and user names. */
export async function findMembership({
  userId,
  teamId,
}: {
  userId: string;
  teamId?: string;
}): Promise<MemberIdentity | null> {
  const { Membership, Team, User } = getModels();
  if (!isId(userId) || (teamId !== undefined && !isId(teamId))) return null;
  const row = await Membership.findOne({
    where: teamId ? { userId, teamId } : { userId },
    order: [
      ["createdAt", "DESC"],
      ["id", "DESC"],
    ],
    include: [
      { model: Team, as: "team", attributes: ["name"] },
      { model: User, as: "user", attributes: ["name", "email"] },
    ],
  });
  // Both joins are inner (the foreign keys are NOT NULL), so a found row carries them.
  if (!row?.team || !row.user) return null;
  return {
    userId,
    teamId: row.teamId as string,
    teamName: row.team.name,
    role: row.role,
    name: row.user.name,
    email: row.user.email,
  };
}
