"use client";

import { RunView } from "@/components/run/run-view";
import type { RunRecord } from "@/lib/client/hooks";
import { SavedStudyView } from "@/components/studies/saved-study-view";

/** The run behind a run link: RunView in its read-only "shared" mode, nothing else of the team. */
export function SharedRun({ run }: { run: RunRecord }) {
  return <RunView run={run} shared studies={<SavedStudyView study={run.study} hideWhenEmpty />} />;
}
