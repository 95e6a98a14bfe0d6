"use client";
// The studies slot of the run page: the study saved with this run (same SWR entry as the run).
import { useRun } from "@/lib/client/hooks";
import { SavedStudyView } from "./saved-study-view";

export function RunStudies({ runId }: { runId: string }) {
  const { data } = useRun(runId);
  if (!data) return null;
  return <SavedStudyView study={data.study ?? null} />;
}
