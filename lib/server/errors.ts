import "server-only";
// One error type with a code, and one translator at the edge of every route handler:
// user error → 4xx with a message naming the field; anything unknown → logged + generic 500.
import { ZodError } from "zod";
import { describeIssues } from "@/lib/schemas/scenario";
import { maskSecrets } from "@/models/db";
import { stripNul } from "@/models/text";
import { ERROR_STATUS, type ErrorCode } from "./error-codes";
import type { ApiErrorJson, IssueJson } from "@/lib/schemas/responses";

export type { IssueJson };

/** A user-facing refusal: its HTTP status follows from its code (ERROR_STATUS, one table). */
export class AppError extends Error {
  readonly status: number;
  constructor(
    readonly code: ErrorCode,
    message: string,
    /** The fields at fault, answered as `issues` (a 400 that names fields). */
    readonly issues?: IssueJson[],
  ) {
    super(message);
    this.name = "AppError";
    this.status = ERROR_STATUS[code];
  }
}

export const badRequest = (message: string, issues?: IssueJson[]) => new AppError("invalid_input", message, issues);
export const unauthorized = (message = "Sign in to continue.") => new AppError("unauthorized", message);
export const forbidden = (message = "Your role does not allow this.") => new AppError("forbidden", message);
export const notFound = (message = "Not found.") => new AppError("not_found", message);
export const conflict = (message: string) => new AppError("conflict", message);
export const gone = (message: string) => new AppError("gone", message);
export const tooLarge = (message: string) => new AppError("too_large", message);

function zodIssues(err: ZodError): IssueJson[] {
  return err.issues.map((i) => ({
    path: i.path.map((p) => (typeof p === "symbol" ? String(p) : p)),
    message: i.message,
    code: i.code,
  }));
}

/** An error as one log text with any database credentials masked. */
function logText(err: unknown): string {
  return maskSecrets(err instanceof Error ? (err.stack ?? `${err.name}: ${err.message}`) : String(err));
}

/** Maps any thrown value to a JSON response. Use once, at the edge of each handler. */
export function errorResponse(err: unknown): Response {
  if (err instanceof AppError) {
    const body: ApiErrorJson = { error: err.code, message: err.message };
    if (err.issues !== undefined) body.issues = err.issues;
    return Response.json(body, { status: err.status });
  }
  if (err instanceof ZodError) {
    const lines = describeIssues(err);
    return Response.json(
      { error: "invalid_input", message: `Invalid input: ${lines.join("; ")}`, issues: zodIssues(err) },
      { status: ERROR_STATUS.invalid_input },
    );
  }
  const name = err instanceof Error ? err.name : "";
  // Driver errors that a user can cause (duplicate name, a reference to a row that is gone).
  if (name === "SequelizeUniqueConstraintError") {
    const fields = Object.keys((err as { fields?: Record<string, unknown> }).fields ?? {}).filter(
      (f) => !/^(id|teamId|userId|scenarioId)$/.test(f),
    );
    const what = fields.length ? ` (same ${fields.join(" and ")})` : "";
    return Response.json(
      {
        error: "conflict",
        message: `That already exists${what}; it may have been saved at the same moment by another request.`,
      },
      { status: ERROR_STATUS.conflict },
    );
  }
  if (name === "SequelizeForeignKeyConstraintError") {
    return Response.json(
      { error: "conflict", message: "A referenced item no longer exists." },
      { status: ERROR_STATUS.conflict },
    );
  }
  if (name === "SequelizeTimeoutError" || (err instanceof Error && /SQLITE_BUSY/.test(err.message))) {
    console.error("[railwise] database busy:", logText(err));
    return Response.json(
      { error: "busy", message: "The database is busy; try again." },
      { status: ERROR_STATUS.busy, headers: { "Retry-After": "1" } },
    );
  }
  console.error("[railwise] unexpected error:", logText(err));
  return Response.json(
    { error: "internal", message: "Something went wrong on the server." },
    { status: ERROR_STATUS.internal },
  );
}

/** Largest JSON body accepted (a scenario with a long capture fits well inside). */
export const MAX_JSON_BYTES = 32 * 1024 * 1024;

/** The body's bytes, counted while streaming; throws `tooBig()` as soon as they pass the limit. */
export async function readBodyBytes(request: Request, limitBytes: number, tooBig: () => AppError): Promise<Uint8Array> {
  if (!request.body) return new Uint8Array(0);
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limitBytes) {
      await reader.cancel().catch(() => undefined);
      throw tooBig();
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** Reads a JSON body; malformed or missing JSON is a 400, an oversized one 413, never a 500. */
export async function readJson(request: Request, limitBytes = MAX_JSON_BYTES): Promise<unknown> {
  const declared = Number(request.headers.get("content-length") ?? "NaN");
  const tooBig = () => tooLarge(`The request body is larger than ${Math.round(limitBytes / (1024 * 1024))} MB.`);
  if (Number.isFinite(declared) && declared > limitBytes) throw tooBig();
  // A chunked body has no Content-Length: count while streaming and stop at the limit (413).
  const text = new TextDecoder().decode(await readBodyBytes(request, limitBytes, tooBig));
  if (!text.trim()) throw badRequest("The request body must be JSON (it was empty).");
  let parsed: unknown;
  try {
    parsed = JSON.parse(text) as unknown;
  } catch {
    throw badRequest("The request body is not valid JSON.");
  }
  // U+0000 is removed from every string at the edge, so both databases store the same text.
  return stripNul(parsed);
}
