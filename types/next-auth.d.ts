// Role and team on next-auth's User, Session.user and JWT (see lib/auth.ts callbacks).
import type { DefaultSession } from "next-auth";
import type { Role } from "@/lib/schemas/roles";

declare module "next-auth" {
  interface User {
    id: string;
    role: Role;
    teamId: string;
    teamName: string;
  }
  interface Session {
    user: {
      id: string;
      name?: string | null;
      email?: string | null;
      role: Role;
      teamId: string;
      teamName: string;
    } & Omit<DefaultSession["user"], "name" | "email">;
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    role?: Role;
    teamId?: string;
    teamName?: string;
  }
}
