import type { Metadata } from "next";
import { RunScreen } from "@/components/run/run-screen";
import { ReviewPanel } from "@/components/review/review-panel";
import { RunReviewState } from "@/components/review/run-review-state";
import { ButtonLink } from "@/components/ui/button";
import { requirePageUser } from "@/lib/server/session";
import { RunStudies } from "@/components/studies/run-studies";
import { requireTeamItemOr404 } from "@/lib/server/session";

export const metadata: Metadata = { title: "Run" };

// A stored run: waveforms, measurements and the scenario snapshot (components/run/run-view.tsx).
export default async function RunPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser();
  await requireTeamItemOr404("run", id, user.teamId);
  return (
    <RunScreen
      runId={id}
      review={<ReviewPanel runId={id} role={user.role} userId={user.id} />}
      studies={<RunStudies runId={id} />}
      actions={
        <>
          <RunReviewState runId={id} />
          <ButtonLink size="sm" variant="secondary" href={`/runs/${id}/compare`}>
            Compare
          </ButtonLink>
          <ButtonLink size="sm" variant="secondary" href={`/runs/${id}/report`}>
            Review report
          </ButtonLink>
        </>
      }
    />
  );
}
