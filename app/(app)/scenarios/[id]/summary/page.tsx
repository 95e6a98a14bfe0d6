import type { Metadata } from "next";
import { DesignSummary } from "@/components/workbench/design-summary";
import { requireTeamItemOr404 } from "@/lib/server/session";
import { requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Design summary" };

// Printable one-page record of a scenario's design (components/workbench/design-summary.tsx).
export default async function SummaryPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  await requireTeamItemOr404("scenario", id, (await requirePageUser()).teamId);
  return <DesignSummary scenarioId={id} />;
}
