// GET|POST /api/auth/* – next-auth's own sign-in, callback, csrf, session and sign-out endpoints,
// wrapped with the guards next-auth does not have: same-origin POSTs, a database-backed limit
// on failed sign-ins (per account and per client address, 429 with Retry-After), and a clear
// 405 for a GET on the credentials callback (which only takes a POST).
import NextAuth from "next-auth";
import { authOptions } from "@/lib/auth";
import { errorResponse } from "@/lib/server/errors";
import {
  checkSameOrigin,
  clearFailures,
  clientAddress,
  lockedFor,
  recordFailure,
  SIGN_IN_ACCOUNT,
  SIGN_IN_ADDRESS,
  tooManyRequests,
} from "@/lib/server/session";

type Ctx = { params: Promise<{ nextauth: string[] }> };

const handler = NextAuth(authOptions) as (request: Request, ctx: Ctx) => Promise<Response>;

const isCredentialsCallback = (request: Request) => new URL(request.url).pathname === "/api/auth/callback/credentials";

// The endpoints next-auth serves for a credentials-only set-up; any other path under /api/auth
// is a 404 here (next-auth itself throws on unknown actions, which would be a 500).
const KNOWN = {
  GET: new Set([
    "csrf",
    "session",
    "providers",
    "signin",
    "signout",
    "error",
    "callback/credentials",
    "signin/credentials",
  ]),
  POST: new Set(["signin/credentials", "callback/credentials", "signout", "session", "_log"]),
};

function known(request: Request, method: "GET" | "POST"): boolean {
  const action = new URL(request.url).pathname.replace(/^\/api\/auth\/?/, "").replace(/\/+$/, "");
  return KNOWN[method].has(action);
}

const notFoundHere = () => Response.json({ error: "not_found", message: "No such sign-in endpoint." }, { status: 404 });

/** next-auth with a last guard: anything it throws on a malformed request is a 400, not a 500. */
async function delegate(request: Request, ctx: Ctx): Promise<Response> {
  try {
    return await handler(request, ctx);
  } catch (err) {
    console.error(
      "[railwise] sign-in endpoint refused a malformed request:",
      err instanceof Error ? err.message : String(err),
    );
    return Response.json(
      { error: "invalid_input", message: "The sign-in request could not be read." },
      { status: 400 },
    );
  }
}

function limited(seconds: number): Response {
  const res = errorResponse(tooManyRequests(seconds));
  res.headers.set("Retry-After", String(seconds));
  return res;
}

export async function GET(request: Request, ctx: Ctx) {
  if (isCredentialsCallback(request)) {
    return Response.json(
      { error: "method_not_allowed", message: "Sign in with a POST from the sign-in page." },
      { status: 405, headers: { Allow: "POST" } },
    );
  }
  if (!known(request, "GET")) return notFoundHere();
  return delegate(request, ctx);
}

export async function POST(request: Request, ctx: Ctx) {
  try {
    checkSameOrigin(request);
  } catch (err) {
    return errorResponse(err);
  }
  if (!known(request, "POST")) return notFoundHere();
  if (!isCredentialsCallback(request)) return delegate(request, ctx);

  // Read the form once (next-auth reads its own copy), bounded: a sign-in form is tiny.
  const copy = request.clone();
  let email = "";
  try {
    const text = (await copy.text()).slice(0, 8192);
    email = (new URLSearchParams(text).get("email") ?? "").trim().toLowerCase().slice(0, 320);
  } catch {
    // next-auth answers a malformed body itself
  }
  const accountKey = email ? `signin:account:${email}` : null;
  const addressKey = `signin:address:${clientAddress(request)}`;
  const wait = Math.max(await lockedFor(addressKey), accountKey ? await lockedFor(accountKey) : 0);
  if (wait > 0) return limited(wait);

  const res = await delegate(request, ctx);
  const signedIn = res.headers.getSetCookie().some((c) => /next-auth\.session-token=[^;]+/.test(c));
  if (signedIn) {
    if (accountKey) await clearFailures(accountKey);
  } else if (email) {
    await recordFailure(addressKey, SIGN_IN_ADDRESS);
    if (accountKey) await recordFailure(accountKey, SIGN_IN_ACCOUNT);
  }
  return res;
}
