import type { Metadata } from "next";
import { ScenarioWorkbench } from "@/components/workbench/workbench";
import { ScenarioReadOnly } from "@/components/workbench/scenario-readonly";
import { canEdit, requirePageUser } from "@/lib/server/session";
import { requireTeamItemOr404 } from "@/lib/server/session";

export const metadata: Metadata = { title: "Scenario" };

// Owners and designers get the Workbench; reviewers and viewers the read-only tables and the
// saved runs' plots. Route handlers enforce the roles again on every write.
export default async function ScenarioPage({ params }: { params: Promise<{ id: string }> }) {
  const [{ id }, user] = await Promise.all([params, requirePageUser()]);
  await requireTeamItemOr404("scenario", id, user.teamId);
  // The Workbench takes the whole window (the header widens with it: app/globals.css .rw-shell).
  return canEdit(user.role) ? (
    <div data-page-width="wide">
      <ScenarioWorkbench scenarioId={id} />
    </div>
  ) : (
    <ScenarioReadOnly scenarioId={id} />
  );
}
