import { badRequest, errorResponse } from "@/lib/server/errors";
import { readLimitedBody, readLimitedForm } from "@/lib/server/request";
import { CAN, requireMember, requireRole } from "@/lib/server/session";
import { importParts } from "@/lib/server/parts";
import { PART_CSV_MAX_BYTES, parsePartsCsv } from "@/lib/schemas/part";

// Room for the multipart envelope around the CSV itself.
const ENVELOPE_BYTES = 16 * 1024;

// POST /api/parts/import – CSV (multipart field "file", or a text/csv body); all or nothing (owner/designer)
export async function POST(request: Request) {
  try {
    const member = await requireMember(request);
    requireRole(member, CAN.edit);
    const type = (request.headers.get("content-type") ?? "").toLowerCase();
    let text: string;
    if (type.startsWith("multipart/form-data")) {
      const file = (await readLimitedForm(request, PART_CSV_MAX_BYTES + ENVELOPE_BYTES)).get("file");
      if (!file || typeof file === "string") throw badRequest('Attach the CSV as the form field "file".');
      text = await file.text();
    } else {
      text = new TextDecoder().decode(await readLimitedBody(request, PART_CSV_MAX_BYTES));
    }
    const { parts, errors } = parsePartsCsv(text);
    if (errors.length) {
      throw badRequest(
        `The CSV was refused (${errors.length} problem${errors.length > 1 ? "s" : ""}); nothing was imported.`,
        errors.slice(0, 50).map((message) => ({ path: ["file"], message })),
      );
    }
    const items = await importParts({ teamId: member.teamId, actorId: member.userId, parts });
    return Response.json({ items }, { status: 201 });
  } catch (err) {
    return errorResponse(err);
  }
}
