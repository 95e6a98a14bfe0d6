import { z } from "zod";
import { AppError, badRequest, errorResponse, tooLarge } from "@/lib/server/errors";
import { formText, readLimitedForm } from "@/lib/server/request";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { createCapture, listCaptures } from "@/lib/server/captures";
import {
  CAPTURE_MAX_BYTES,
  CaptureError,
  inspectCsv,
  parseCapture,
  TIME_UNIT_SCALE,
  type TimeUnit,
} from "@/lib/captures/parse";

// The multipart envelope (boundaries, the other fields) on top of the file itself.
const ENVELOPE_BYTES = 64 * 1024;

const fieldsSchema = z.object({
  name: z.string().trim().max(120, { message: "name must be at most 120 characters" }).optional(),
  timeColumn: z
    .string({ error: "timeColumn is required (a header name or a column number)" })
    .trim()
    .min(1, { message: "timeColumn is required" }),
  voltsColumn: z
    .string({ error: "voltsColumn is required (a header name or a column number)" })
    .trim()
    .min(1, { message: "voltsColumn is required" }),
  timeUnit: z
    .enum(Object.keys(TIME_UNIT_SCALE) as [TimeUnit, ...TimeUnit[]], { error: "timeUnit must be one of s, ms, us, ns" })
    .default("s"),
  hasHeader: z.enum(["true", "false"], { error: 'hasHeader must be "true" or "false"' }).optional(),
});

/**
 * A column by header name, or by 1-based number ("2" = the second column, as people count).
 * A header literally named "2" wins over the number.
 */
function columnRef(text: string, columns: string[]): string | number {
  if (columns.includes(text)) return text;
  return /^\d+$/.test(text) ? Number(text) - 1 : text;
}

// GET /api/captures – the team's captures without samples (every role)
export async function GET(request: Request) {
  try {
    const member = await requireMember(request);
    return Response.json({ items: await listCaptures({ teamId: member.teamId }) });
  } catch (err) {
    return errorResponse(err);
  }
}

// POST /api/captures – multipart CSV upload: file, timeColumn?, voltsColumn? (name or 1-based number; default 1 and 2),
// timeUnit?, name? (owner/designer; > 5 MB or > 200,000 rows → 413)
export async function POST(request: Request) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.edit);
    const form = await readLimitedForm(request, CAPTURE_MAX_BYTES + ENVELOPE_BYTES);
    const file = form.get("file");
    if (!file || typeof file === "string")
      throw badRequest('Attach the CSV as the form field "file".', [{ path: ["file"], message: "required" }]);
    if (file.size > CAPTURE_MAX_BYTES)
      throw tooLarge(`The file is larger than ${CAPTURE_MAX_BYTES / (1024 * 1024)} MB.`);
    // Without a choice, the first column is time and the second volts (the usual scope export).
    const fields = fieldsSchema.parse({
      name: formText(form, "name"),
      timeColumn: formText(form, "timeColumn") ?? formText(form, "time") ?? "1",
      voltsColumn: formText(form, "voltsColumn") ?? formText(form, "volts") ?? formText(form, "valueColumn") ?? "2",
      timeUnit: formText(form, "timeUnit") || undefined,
      hasHeader: formText(form, "hasHeader") || undefined,
    });
    const hasHeader = fields.hasHeader === undefined ? undefined : fields.hasHeader === "true";
    let parsed;
    try {
      const text = await file.text();
      const { columns } = inspectCsv(text, 0);
      parsed = parseCapture(text, {
        timeColumn: columnRef(fields.timeColumn, columns),
        voltsColumn: columnRef(fields.voltsColumn, columns),
        timeUnit: fields.timeUnit,
        hasHeader,
      });
    } catch (err) {
      if (err instanceof CaptureError) {
        throw new AppError(err.code === "too_large" ? "too_large" : "invalid_input", err.message, [
          { path: [err.field], message: err.message },
        ]);
      }
      throw err;
    }
    const filename = file.name && file.name !== "blob" ? file.name.slice(0, 200) : null;
    const name = fields.name || (filename ? filename.replace(/\.[^.]+$/, "") : "capture");
    const capture = await createCapture({
      teamId: member.teamId,
      actorId: member.userId,
      name,
      sourceFilename: filename,
      parsed,
    });
    const { samples: _samples, ...summary } = capture;
    return Response.json(summary, { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
