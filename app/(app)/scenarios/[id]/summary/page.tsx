import type { Metadata } from "next";
import { DesignSummary } from "@/components/workbench/design-summary";

export const metadata: Metadata = { title: "Design summary" };

// Printable one-page record of a scenario's design (components/workbench/design-summary.tsx).
export default async function SummaryPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  return <DesignSummary scenarioId={id} />;
}
