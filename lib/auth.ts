// next-auth v4 options: credentials sign-in (bcryptjs), JWT sessions carrying user id, team
// and role. The route at app/api/auth/[...nextauth] only re-exports GET/POST (next-auth#7498).
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { findMembership, verifyCredentials } from "@/lib/server/accounts";

/** Used only outside production so `npm run dev` and tests work without configuration. */
export const DEV_AUTH_SECRET = "railwise-development-secret-not-for-production";

export function authSecret(): string | undefined {
  const fromEnv = process.env.NEXTAUTH_SECRET?.trim();
  if (fromEnv) return fromEnv;
  // In production next-auth refuses to run without a secret (NO_SECRET); `npm start`
  // generates and persists one in data/ so a fresh machine still works.
  return process.env.NODE_ENV === "production" ? undefined : DEV_AUTH_SECRET;
}

export const authOptions: NextAuthOptions = {
  secret: authSecret(),
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
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
      if (user) {
        token.sub = user.id;
        token.role = user.role;
        token.teamId = user.teamId;
        token.teamName = user.teamName;
        return token;
      }
      // A role can change (or a member be removed) after sign-in: refresh from the database.
      if (token.sub && token.teamId) {
        const member = await findMembership({ userId: token.sub, teamId: token.teamId });
        if (member) {
          token.role = member.role;
          token.teamName = member.teamName;
          token.name = member.name;
        } else {
          delete token.role;
        }
      }
      return token;
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
      }
      return session;
    },
  },
};
