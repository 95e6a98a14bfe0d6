// Client-side JSON over fetch. Every non-2xx becomes an HttpError so SWR's `error` and
// form handlers see the server's message instead of a half-parsed body.

export interface ApiErrorBody {
  error?: string;
  message?: string;
  issues?: unknown;
}

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
    const lines = issueLines(body.issues);
    const head = body.message ?? body.error ?? `Request failed (${status})`;
    return lines.length ? `${head}: ${lines.join("; ")}` : head;
  }
  if (typeof body === "string" && body.trim() && body.length < 300) return body.trim();
  if (status === 401) return "Your session has ended; sign in again.";
  if (status === 403) return "Your role does not allow this.";
  if (status === 404) return "Not found.";
  return `Request failed (${status})`;
}

/** zod issues as "path: message" lines, whether the server sent strings or issue objects. */
function issueLines(issues: unknown): string[] {
  if (!Array.isArray(issues)) return [];
  return issues.slice(0, 5).map((i) => {
    if (typeof i === "string") return i;
    if (i && typeof i === "object") {
      const { path, message } = i as { path?: unknown; message?: unknown };
      const p = Array.isArray(path) && path.length ? `${path.join(".")}: ` : "";
      return `${p}${String(message ?? "")}`;
    }
    return String(i);
  });
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
