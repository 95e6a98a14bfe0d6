// GET|POST /api/auth/* – next-auth's own sign-in, callback, csrf, session and sign-out endpoints.
import NextAuth from "next-auth";
import { authOptions } from "@/lib/auth";

const handler = NextAuth(authOptions);

export { handler as GET, handler as POST };
