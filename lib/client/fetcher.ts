// Client-side JSON over fetch. Every non-2xx becomes an HttpError so SWR's `error` and
// form handlers see the server's message instead of a half-parsed body.
import type { ApiErrorJson } from "@/lib/schemas/responses";
import { apiIssuesText } from "@/lib/workbench/screen-words";

/** An error answer as it arrives: the API's shape (ApiErrorJson), unchecked, so every part may be missing. */
export type ApiErrorBody = Partial<ApiErrorJson>;

export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly body: ApiErrorBody | string | null,
  ) {
    super(describeError(status, body));
    this.name = "HttpError";
  }
}

function describeError(status: number, body: ApiErrorBody | string | null): string {
  if (body && typeof body === "object") {
    // A 400's zod issues name the fields by the labels on the screen (lib/workbench/screen-words.ts).
    return apiIssuesText(body) ?? body.message ?? body.error ?? `Request failed (${status})`;
  }
  if (typeof body === "string" && body.trim() && body.length < 300) return body.trim();
  if (status === 401) return "Your session has ended; sign in again.";
  if (status === 403) return "Your role does not allow this.";
  if (status === 404) return "Not found.";
  return `Request failed (${status})`;
}

/** GET (or any method) returning parsed JSON; throws HttpError on non-2xx. 204 → null. */
export async function fetchJson<T>(url: string, init?: RequestInit): Promise<T> {
  const res = await fetch(url, {
    ...init,
    headers: { accept: "application/json", ...(init?.headers ?? {}) },
    credentials: "same-origin",
  });
  const text = await res.text();
  let body: unknown = null;
  if (text) {
    try {
      body = JSON.parse(text);
    } catch {
      body = text;
    }
  }
  if (!res.ok) throw new HttpError(res.status, body as ApiErrorBody | string | null);
  return body as T;
}

/** POST/PUT/PATCH/DELETE with a JSON body. */
export function sendJson<T>(url: string, method: "POST" | "PUT" | "PATCH" | "DELETE", body?: unknown): Promise<T> {
  return fetchJson<T>(url, {
    method,
    headers: body === undefined ? undefined : { "content-type": "application/json" },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
}

/** A readable line for any thrown value (toasts, inline errors). */
export function errorMessage(err: unknown): string {
  if (err instanceof Error) return err.message;
  return String(err);
}
