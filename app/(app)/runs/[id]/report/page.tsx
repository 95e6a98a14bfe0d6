import type { Metadata } from "next";
import { ReportView } from "@/components/review/report-view";
import { requireTeamItemOr404 } from "@/lib/server/session";
import { requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Design review report" };

// The printable design review report of one run (A4 and Letter).
export default async function RunReportPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  await requireTeamItemOr404("run", id, (await requirePageUser()).teamId);
  return <ReportView runId={id} />;
}
