// GET /api/health – liveness plus a database round trip (no session needed).
import { errorResponse } from "@/lib/server/errors";
import { checkDatabase } from "@/lib/server/health";

export const dynamic = "force-dynamic";

export async function GET() {
  try {
    const db = await checkDatabase();
    return Response.json({ status: "ok", database: db, time: new Date().toISOString() });
  } catch (err) {
    return errorResponse(err);
  }
}
