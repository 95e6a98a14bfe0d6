import "server-only";
// Who is calling, for route handlers and pages, plus the two request guards every handler goes
// through:
// - the session: the cookie is decrypted here (lib/session-token.ts, a key derived once per
//   secret) and the member's generation, role, name and team are re-read in one indexed query
//   (lib/auth.ts readSessionState), so a signed-out or demoted cookie is refused at once.
//   Nothing is re-encoded or re-sent: next-auth's getServerSession re-encrypted the token and set
//   the cookie again on every answer. Sessions therefore last 12 h from sign-in;
// - cross-site request forgery: state-changing requests must come from our own origin and carry
//   a JSON (or multipart upload) body, or they are refused with 403 before anything is read.
import { createHash } from "node:crypto";
import { cookies } from "next/headers";
import { QueryTypes } from "sequelize";
import { authSecret, readSessionState, servedOverHttps } from "@/lib/auth";
import { readSessionToken } from "@/lib/session-token";
import type { Role } from "@/lib/schemas/roles";
import { notFound, redirect } from "next/navigation";
import { getModels, getSequelize } from "@/models";
import { isId } from "./ids";
import { AppError, forbidden, unauthorized } from "./errors";

export interface Member {
  userId: string;
  teamId: string;
  teamName: string;
  role: Role;
  name: string;
  email: string;
}

/** Roles per action (DEVELOPERS.md § Roles). */
export const CAN = {
  read: ["owner", "designer", "reviewer", "viewer"],
  edit: ["owner", "designer"], // scenarios, runs, captures, part profiles, run links
  comment: ["owner", "designer", "reviewer"],
  signOff: ["owner", "reviewer"],
  manageTeam: ["owner"], // invite, change roles, remove members, create boards
} as const satisfies Record<string, readonly Role[]>;

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** The origin the browser saw: Host (or the forwarded host) with the request's scheme. */
function ownOrigins(request: Request): Set<string> {
  const url = new URL(request.url);
  const out = new Set<string>([url.origin]);
  const host = request.headers.get("x-forwarded-host") ?? request.headers.get("host");
  if (host) {
    const proto = (request.headers.get("x-forwarded-proto") ?? url.protocol.replace(":", "")).split(",")[0].trim();
    out.add(`${proto}://${host}`);
  }
  for (const base of [process.env.APP_URL, process.env.NEXTAUTH_URL]) {
    if (base) {
      try {
        out.add(new URL(base).origin);
      } catch {
        // a malformed APP_URL is reported by the start script, not here
      }
    }
  }
  return out;
}

/**
 * Refuses (403) a state-changing request a browser sent from another site: its `Origin` must be
 * ours, or — without Origin — `Sec-Fetch-Site` must be same-origin. Browsers send at least one
 * of the two on every non-GET request, so a request with neither is not a browser acting for a
 * signed-in victim (curl, the test client) and passes this check.
 */
export function checkSameOrigin(request: Request): void {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return;
  const origin = request.headers.get("origin");
  if (origin !== null) {
    if (!ownOrigins(request).has(origin)) {
      throw new AppError("cross_origin", `Requests from another site are refused (Origin ${origin.slice(0, 100)}).`);
    }
    return;
  }
  const site = request.headers.get("sec-fetch-site");
  if (site !== null && site !== "same-origin" && site !== "none") {
    throw new AppError("cross_origin", `Requests from another site are refused (Sec-Fetch-Site ${site.slice(0, 40)}).`);
  }
}

/** Whether the request has a body (declared length above 0, or a chunked stream). */
function hasBody(request: Request): boolean {
  const length = request.headers.get("content-length");
  if (length !== null) return Number(length) > 0;
  // HTTP/1.1: without Content-Length or Transfer-Encoding a request has no body (the platform
  // may still hand an empty stream to the handler).
  return request.headers.has("transfer-encoding");
}

/**
 * Refuses (403) a body a plain HTML form or `text/plain` fetch could send across sites: bodies
 * must be `application/json`, or `multipart/form-data` / `text/csv` where the route takes an upload.
 */
export function checkBodyType(request: Request, { multipart = false }: { multipart?: boolean } = {}): void {
  if (SAFE_METHODS.has(request.method.toUpperCase()) || !hasBody(request)) return;
  const type = (request.headers.get("content-type") ?? "").split(";")[0].trim().toLowerCase();
  // Upload routes also take raw text/csv: not a type a cross-site form or a fetch without a CORS
  // preflight can send, so it cannot carry a forged request.
  if (type === "application/json" || (multipart && (type === "multipart/form-data" || type === "text/csv"))) return;
  const want = multipart ? "application/json, multipart/form-data or text/csv" : "application/json";
  throw new AppError(
    "unsupported_content_type",
    `Send the body as ${want} (content-type was ${type ? `"${type.slice(0, 80)}"` : "missing"}).`,
  );
}

/** Both request guards; upload routes pass `multipart: true`. */
export function guardRequest(request: Request, options: { multipart?: boolean } = {}): void {
  checkSameOrigin(request);
  checkBodyType(request, options);
}

/** Routes that take multipart uploads (the captures and part-profile CSV imports). */
function takesUpload(request: Request): boolean {
  const path = new URL(request.url).pathname;
  return path === "/api/captures" || path === "/api/parts/import";
}

/**
 * The signed-in member (401 without a valid session). With the request, non-GET calls are first
 * checked for cross-site forgery (403).
 */
export async function requireMember(request?: Request): Promise<Member> {
  if (request) guardRequest(request, { multipart: takesUpload(request) });
  const member = await sessionMember();
  if (!member) throw unauthorized();
  return member;
}

/** The session cookie's value; next-auth splits one past 4 kB into name.0, name.1, … */
function sessionCookie(jar: Awaited<ReturnType<typeof cookies>>): string | null {
  const name = `${servedOverHttps() ? "__Secure-" : ""}next-auth.session-token`;
  const whole = jar.get(name)?.value;
  if (whole) return whole;
  const chunks = jar
    .getAll()
    .filter((c) => c.name.startsWith(`${name}.`))
    .sort((a, b) => Number(a.name.slice(name.length + 1)) - Number(b.name.slice(name.length + 1)));
  return chunks.length ? chunks.map((c) => c.value).join("") : null;
}

/**
 * The member the request's session cookie names, or null: no cookie, a token that does not
 * decrypt or has expired, or one whose generation or role the database no longer holds.
 */
async function sessionMember(): Promise<Member | null> {
  const secret = authSecret();
  const token = sessionCookie(await cookies());
  if (!token || !secret) return null;
  const claims = await readSessionToken(token, secret); // null: tampered, another secret, expired
  const { sub, teamId, role, gen } = claims ?? {};
  if (typeof sub !== "string" || typeof teamId !== "string" || typeof gen !== "number") return null;
  const state = await readSessionState(sub, teamId);
  if (!state || state.generation !== gen || state.role !== role) return null;
  return { userId: sub, teamId, teamName: state.teamName, role: state.role, name: state.name, email: state.email };
}

/** Throws 403 unless the member's role is one of `roles`; returns the member for chaining. */
export function requireRole(member: Member, roles: readonly Role[]): Member {
  if (!roles.includes(member.role)) {
    throw forbidden(`Your role (${member.role}) does not allow this; it needs ${roles.join(" or ")}.`);
  }
  return member;
}

// ---- Rate limits (sign-in and invitation acceptance), stored in the database ----

export interface RateRule {
  /** Failures allowed inside `windowMs` before the key is locked. */
  maxFailures: number;
  windowMs: number;
  lockMs: number;
}

/** Per account: 5 wrong passwords in 15 min lock it for 15 min. Per address: 20. */
export const SIGN_IN_ACCOUNT: RateRule = { maxFailures: 5, windowMs: 15 * 60_000, lockMs: 15 * 60_000 };
export const SIGN_IN_ADDRESS: RateRule = { maxFailures: 20, windowMs: 15 * 60_000, lockMs: 15 * 60_000 };
export const INVITE_ADDRESS: RateRule = { maxFailures: 20, windowMs: 15 * 60_000, lockMs: 15 * 60_000 };

export const tooManyRequests = (retryAfterS: number) =>
  new AppError("rate_limited", `Too many failed attempts; try again in ${Math.ceil(retryAfterS / 60)} min.`);

/**
 * The stored form of a rate-limit key: its kind ("signin:account:") and a SHA-256 of the rest,
 * so a key of any length (a 320-character email) fits the column (varchar(255) on PostgreSQL)
 * and the table holds no email addresses.
 */
export function rateKey(key: string): string {
  // The kind is the first two segments: an email or an IPv6 address may hold colons itself.
  const kind = /^[a-z]+:[a-z]+:/.exec(key)?.[0] ?? "";
  return `${kind}${createHash("sha256").update(key.slice(kind.length)).digest("hex")}`;
}

/** Seconds until `key` may try again, or 0 when it is not locked. */
export async function lockedFor(rawKey: string, now = Date.now()): Promise<number> {
  const key = rateKey(rawKey);
  const rows = await getSequelize().query<{ lockedUntil: number | string }>(
    `SELECT "lockedUntil" FROM "rate_limits" WHERE "key" = :key`,
    {
      replacements: { key },
      type: QueryTypes.SELECT,
    },
  );
  const until = Number(rows[0]?.lockedUntil ?? 0);
  return until > now ? Math.ceil((until - now) / 1000) : 0;
}

/** Counts one failure against `key`; locks it once the rule's count is reached in its window. */
export async function recordFailure(rawKey: string, rule: RateRule, now = Date.now()): Promise<void> {
  const key = rateKey(rawKey);
  const sequelize = getSequelize();
  await sequelize.transaction(async (transaction) => {
    const rows = await sequelize.query<{ failures: number | string; windowStart: number | string }>(
      `SELECT "failures", "windowStart" FROM "rate_limits" WHERE "key" = :key`,
      { replacements: { key }, type: QueryTypes.SELECT, transaction },
    );
    const row = rows[0];
    const fresh = !row || now - Number(row.windowStart) > rule.windowMs;
    const failures = fresh ? 1 : Number(row.failures) + 1;
    const windowStart = fresh ? now : Number(row.windowStart);
    const lockedUntil = failures >= rule.maxFailures ? now + rule.lockMs : 0;
    // One upsert statement both dialects understand (SQLite ≥ 3.24, PostgreSQL ≥ 9.5).
    await sequelize.query(
      `INSERT INTO "rate_limits" ("key", "failures", "windowStart", "lockedUntil") VALUES (:key, :failures, :windowStart, :lockedUntil)
       ON CONFLICT ("key") DO UPDATE SET "failures" = :failures, "windowStart" = :windowStart, "lockedUntil" = :lockedUntil`,
      { replacements: { key, failures, windowStart, lockedUntil }, transaction },
    );
  });
}

/** A success clears the key (the account's count, not the address's). */
export async function clearFailures(rawKey: string): Promise<void> {
  await getSequelize().query(`DELETE FROM "rate_limits" WHERE "key" = :key`, {
    replacements: { key: rateKey(rawKey) },
  });
}

/**
 * The caller's network address. The server process (scripts/peer-address.cjs) sets
 * x-forwarded-for to the socket's peer address, or keeps the one a trusted reverse proxy
 * (RAILWISE_TRUSTED_PROXIES) wrote; the first entry is the client.
 */
export function clientAddress(request: Request): string {
  const forwarded = request.headers.get("x-forwarded-for");
  const first = forwarded?.split(",")[0]?.trim();
  return (first || "unknown").slice(0, 64);
}

// ---- Pages for one item ----

/**
 * For pages of one board, scenario or run: 404 (Next's not-found page) unless `id` names an
 * item of the viewer's team, like the API answers — never an empty view of another team's id.
 */
export async function requireTeamItemOr404(
  kind: "board" | "scenario" | "run",
  id: string,
  teamId: string,
): Promise<void> {
  if (!isId(id)) notFound();
  const { Board, Scenario, Run } = getModels();
  const where = { where: { id, teamId }, attributes: ["id"] };
  const row =
    kind === "board"
      ? await Board.findOne(where)
      : kind === "scenario"
        ? await Scenario.findOne(where)
        : await Run.findOne(where);
  if (!row) notFound();
}

// Server pages: who is signed in. Pages only decide what to show; route handlers enforce.

export interface PageUser {
  id: string;
  name: string | null;
  email: string | null;
  role: Role;
  teamId: string;
  teamName: string;
}

/** May create, edit and delete scenarios, runs, captures and part profiles: the role table's `edit` row (CAN above, DEVELOPERS.md § Roles). */
export function canEdit(role: Role): boolean {
  return (CAN.edit as readonly Role[]).includes(role);
}

/** The signed-in member for a server page, or null. Pages only decide what to show; route handlers enforce. */
export async function getPageUser(): Promise<PageUser | null> {
  const m = await sessionMember();
  if (!m) return null;
  return { id: m.userId, name: m.name, email: m.email, role: m.role, teamId: m.teamId, teamName: m.teamName };
}

/** Same, but sends anyone without a session to the sign-in page. */
export async function requirePageUser(): Promise<PageUser> {
  const user = await getPageUser();
  if (!user) redirect("/signin");
  return user;
}
