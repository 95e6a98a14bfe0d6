// next-auth v4 options: credentials sign-in (bcryptjs), JWT sessions carrying user id, team,
// role and the user's session generation. The route at app/api/auth/[...nextauth] wraps
// next-auth's GET/POST with the sign-in rate limit (next-auth#7498 for the re-export form).
//
// Ending sessions: a JWT cannot be recalled, so every token carries the user's
// `sessionGeneration` (users table, migration 0003) and the role it was issued for. Each
// request re-reads both in one indexed query, prepared once (models/prepared.ts): the primary
// key of users joined with the unique (userId, teamId) index of memberships. Sign-out, role
// change and removal bump the generation, so a copied cookie stops working at once instead of
// at the 12 h expiry.
import type { NextAuthOptions } from "next-auth";
import type { JWT } from "next-auth/jwt";
import CredentialsProvider from "next-auth/providers/credentials";
import { QueryTypes, type Transaction } from "sequelize";
import { verifyCredentials } from "@/lib/server/accounts";
import type { Role } from "@/lib/schemas/roles";
import { getSequelize } from "@/models";
import { selectOnePrepared } from "@/models/prepared";

/** Used only outside production so `npm run dev` and tests work without configuration. */
export const DEV_AUTH_SECRET = "railwise-development-secret-not-for-production";

export function authSecret(): string | undefined {
  const fromEnv = process.env.NEXTAUTH_SECRET?.trim();
  if (fromEnv) return fromEnv;
  // In production next-auth refuses to run without a secret (NO_SECRET); `npm start`
  // generates and persists one in data/ so a fresh machine still works.
  return process.env.NODE_ENV === "production" ? undefined : DEV_AUTH_SECRET;
}

/** Cookies get the Secure flag (and the __Secure- prefix) when the app is served over https. */
export function servedOverHttps(): boolean {
  const base = process.env.NEXTAUTH_URL || process.env.APP_URL || "";
  return base.toLowerCase().startsWith("https://");
}

export interface SessionState {
  generation: number;
  role: Role;
  name: string;
  email: string;
  teamName: string;
}

/** The user's current generation and membership in one query; null when the membership is gone. */
export async function readSessionState(userId: string, teamId: string): Promise<SessionState | null> {
  const row = await selectOnePrepared<SessionState>(
    getSequelize(),
    "railwise_session_state",
    `SELECT u."sessionGeneration" AS "generation", m."role" AS "role", u."name" AS "name", u."email" AS "email", t."name" AS "teamName"
       FROM "memberships" m
       JOIN "users" u ON u."id" = m."userId"
       JOIN "teams" t ON t."id" = m."teamId"
      WHERE m."userId" = $1 AND m."teamId" = $2`,
    [userId, teamId],
  );
  return row ? { ...row, generation: Number(row.generation) } : null;
}

/** Ends every session of a user (sign-out, role change, removal). Safe inside a transaction. */
export async function bumpSessionGeneration(userId: string, transaction?: Transaction): Promise<void> {
  await getSequelize().query(`UPDATE "users" SET "sessionGeneration" = "sessionGeneration" + 1 WHERE "id" = :userId`, {
    replacements: { userId },
    transaction,
  });
}

async function currentGeneration(userId: string): Promise<number> {
  const rows = await getSequelize().query<{ generation: number }>(
    `SELECT "sessionGeneration" AS "generation" FROM "users" WHERE "id" = :userId`,
    {
      replacements: { userId },
      type: QueryTypes.SELECT,
    },
  );
  return Number(rows[0]?.generation ?? 0);
}

type RailwiseJwt = JWT & { gen?: number };

/** An ended session: next-auth then answers an empty session and handlers a 401. */
function ended(token: RailwiseJwt): RailwiseJwt {
  return { ...token, role: undefined, teamId: undefined, gen: undefined, ended: true } as RailwiseJwt;
}

export const authOptions: NextAuthOptions = {
  secret: authSecret(),
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
  useSecureCookies: servedOverHttps(),
  pages: { signIn: "/signin", signOut: "/signout" },
  providers: [
    CredentialsProvider({
      id: "credentials",
      name: "E-mail and password",
      credentials: {
        email: { label: "E-mail", type: "email" },
        password: { label: "Password", type: "password" },
      },
      async authorize(credentials) {
        const email = typeof credentials?.email === "string" ? credentials.email : "";
        const password = typeof credentials?.password === "string" ? credentials.password : "";
        if (!email || !password || email.length > 320 || password.length > 1024) return null;
        const member = await verifyCredentials(email, password);
        if (!member) return null;
        return {
          id: member.userId,
          name: member.name,
          email: member.email,
          role: member.role,
          teamId: member.teamId,
          teamName: member.teamName,
        };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      const t = token as RailwiseJwt;
      if (user) {
        t.sub = user.id;
        t.role = user.role;
        t.teamId = user.teamId;
        t.teamName = user.teamName;
        t.gen = await currentGeneration(user.id);
        return t;
      }
      if (!t.sub || !t.teamId || !t.role || typeof t.gen !== "number") return ended(t);
      // Every request: one query. A bumped generation (sign-out elsewhere, role change,
      // removal), a changed role or a missing membership ends this session.
      const state = await readSessionState(t.sub, t.teamId);
      if (!state || state.generation !== t.gen || state.role !== t.role) return ended(t);
      t.teamName = state.teamName;
      t.name = state.name;
      t.email = state.email;
      return t;
    },
    async session({ session, token }) {
      if (token.sub && token.role && token.teamId) {
        session.user = {
          id: token.sub,
          name: token.name ?? null,
          email: token.email ?? null,
          role: token.role,
          teamId: token.teamId,
          teamName: token.teamName ?? "",
        };
      } else {
        // next-auth keeps `user` from the default session; an ended session carries none.
        (session as { user?: unknown }).user = undefined;
      }
      return session;
    },
  },
  events: {
    // Sign-out ends every session of the user, including copies of this cookie.
    async signOut({ token }) {
      const sub = (token as RailwiseJwt | null)?.sub;
      if (sub) await bumpSessionGeneration(sub);
    },
  },
};
