"use client";

import { useSignoffs } from "@/lib/client/team-hooks";
import { ReviewStateBadge } from "./review-state-badge";

/** The run's review state for its title row; shares the SWR key with the sign-off panel, so it updates with it. */
export function RunReviewState({ runId }: { runId: string }) {
  const { data } = useSignoffs(runId);
  if (!data) return null;
  return (
    <span className="inline-flex items-center" data-testid="run-review-state" title="Review state (latest sign-off)">
      <ReviewStateBadge decision={data.items[0]?.decision ?? null} />
    </span>
  );
}
