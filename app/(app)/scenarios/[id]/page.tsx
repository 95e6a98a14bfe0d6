import type { Metadata } from "next";
import { ScenarioReadView } from "@/components/scenario/scenario-read-view";
import { requirePageUser } from "@/lib/page-session";

export const metadata: Metadata = { title: "Scenario" };

// Thin on purpose: the workbench mounts here for owners/designers (canEdit from lib/page-session);
// reviewers and viewers keep the read-only tables.
export default async function ScenarioPage({ params }: { params: Promise<{ id: string }> }) {
  const [{ id }] = await Promise.all([params, requirePageUser()]);
  return <ScenarioReadView scenarioId={id} />;
}
