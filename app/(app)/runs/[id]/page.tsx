import type { Metadata } from "next";
import { RunScreen } from "@/components/run/run-screen";
import { ReviewPanel } from "@/components/review/review-panel";
import { RunReviewState } from "@/components/review/run-review-state";
import { requirePageUser } from "@/lib/page-session";
import { RunStudies } from "@/components/studies/run-studies";

export const metadata: Metadata = { title: "Run" };

// A stored run: waveforms, measurements and the scenario snapshot (components/run/run-view.tsx).
export default async function RunPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await requirePageUser();
  return (
    <RunScreen
      runId={id}
      // SLOT — review: the team side mounts sign-off, comments and run links here, e.g. review={<RunReview runId={id} />}.
      review={<ReviewPanel runId={id} role={user.role} />}
      // SLOT — studies: saved noise-margin / tolerance-spread studies of this run, e.g. studies={<RunStudies runId={id} />}.
      studies={<RunStudies runId={id} />}
      actions={<RunReviewState runId={id} />}
    />
  );
}
