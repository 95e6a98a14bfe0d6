"use client";
// The studies card bound to the Workbench store: studies run on the current draft; saving asks
// the server for a new run of the saved scenario and stores the study with it (the server
// re-checks the study against that run's snapshot, so the draft must be saved first).
import { useMemo } from "react";
import { useSWRConfig } from "swr";
import { sendJson } from "@/lib/client/fetcher";
import { runsKey, type RunRecord } from "@/lib/client/hooks";
import { scenarioSchema } from "@/lib/schemas/scenario";
import type { StudyUpload } from "@/lib/schemas/study";
import { useWb, useWbApi } from "@/components/workbench/store";
import { refuseIfInvalid } from "@/components/workbench/field-problems";
import { StudiesCard } from "./studies-card";

export function WorkbenchStudies() {
  const draft = useWb((s) => s.draft);
  const api = useWbApi();
  const scenarioId = useWb((s) => s.scenarioId);
  const { mutate } = useSWRConfig();
  const scenario = useMemo(() => {
    const r = scenarioSchema.safeParse(draft);
    return r.success ? r.data : null;
  }, [draft]);
  const revision = useWb((s) => s.revision);
  const dirty = useWb((s) => s.revision !== s.savedRevision);
  const onSave = async (upload: StudyUpload) => {
    const run = await sendJson<RunRecord>("/api/runs", "POST", { scenarioId, label: "with studies" });
    await sendJson(`/api/runs/${run.id}/study`, "PUT", upload);
    await mutate(runsKey(scenarioId));
    return run.id;
  };
  return (
    <StudiesCard
      scenario={scenario}
      revision={revision}
      beforeRun={() => !refuseIfInvalid(api, ["scenario", "study"], "Study run")}
      saveBlocked={dirty ? "Save the scenario first: the run is made from the saved version." : null}
      onSave={onSave}
    />
  );
}
