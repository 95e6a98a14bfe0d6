import "server-only";
import { type AppError, badRequest, MAX_JSON_BYTES, readBodyBytes, tooLarge } from "@/lib/server/errors";

// Request bodies beyond plain JSON (which is errors.ts's readJson): an optional JSON body, and
// uploads cut off at a byte limit while streaming (413) instead of being buffered whole first.

/** Like readJson, but an empty body means `{}` (e.g. a run link without options). */
export async function readOptionalJson(request: Request, limitBytes = MAX_JSON_BYTES): Promise<unknown> {
  const text = new TextDecoder().decode(await readLimitedBody(request, limitBytes));
  if (!text.trim()) return {};
  try {
    return JSON.parse(text) as unknown;
  } catch {
    throw badRequest("The request body is not valid JSON.");
  }
}

function tooLargeError(limitBytes: number): AppError {
  const size =
    limitBytes >= 1024 * 1024 ? `${Math.round(limitBytes / (1024 * 1024))} MB` : `${Math.round(limitBytes / 1024)} KB`;
  return tooLarge(`The upload is larger than ${size}.`);
}

/** The body as bytes, refusing (413) as soon as it passes `limitBytes`. */
export async function readLimitedBody(request: Request, limitBytes: number): Promise<Uint8Array> {
  const declared = Number(request.headers.get("content-length") ?? "NaN");
  if (Number.isFinite(declared) && declared > limitBytes) throw tooLargeError(limitBytes);
  return readBodyBytes(request, limitBytes, () => tooLargeError(limitBytes));
}

/** multipart/form-data with a byte limit on the whole body. */
export async function readLimitedForm(request: Request, limitBytes: number): Promise<FormData> {
  const type = request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("multipart/form-data")) {
    throw badRequest('Send the file as multipart/form-data (field "file").');
  }
  const bytes = await readLimitedBody(request, limitBytes);
  try {
    return await new Response(bytes as BodyInit, { headers: { "content-type": type } }).formData();
  } catch {
    throw badRequest("The multipart body could not be read.");
  }
}

/** A text field of a form, or the fallback. */
export function formText(form: FormData, name: string): string | undefined {
  const v = form.get(name);
  return typeof v === "string" ? v : undefined;
}
