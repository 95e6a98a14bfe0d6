"use client";
// /runs/[id] body: loads the run (SWR) and shows it with RunView; review and studies panels
// arrive through the slots from the page.
import type { ReactNode } from "react";
import { useRun } from "@/lib/client/hooks";
import { LoadGate } from "@/components/ui/load-state";
import { RunView } from "./run-view";

export function RunScreen({
  runId,
  review,
  studies,
  actions,
}: {
  runId: string;
  review?: ReactNode;
  studies?: ReactNode;
  actions?: ReactNode;
}) {
  const { data, error, isLoading, mutate } = useRun(runId);
  return (
    <LoadGate
      notFoundTitle="Run not found"
      rows={8}
      data={data}
      error={error}
      isLoading={isLoading}
      onRetry={() => void mutate()}
    >
      {(run) => <RunView run={run} review={review} studies={studies} actions={actions} />}
    </LoadGate>
  );
}
