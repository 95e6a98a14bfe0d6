import "server-only";
// Studies stored with their run (runs.study). The client uploads the configuration and the raw
// per-task outputs; the server re-runs every task itself in the simulation pool (sim-worker.ts:
// each task through the same run bounds as a run, the whole study under one wall-time budget),
// refuses an upload that disagrees on any task, and stores only its own task outputs and the
// summaries computed from them — so a saved study holds no number the client made up.
import { getModels, getSequelize } from "@/models";
import { parseScenario, ScenarioError } from "@/lib/schemas/scenario";
import type { SavedStudy, StudyUpload } from "@/lib/studies";
import { recordAudit } from "./audit";
import { AppError, notFound } from "./errors";
import { isId } from "./ids";
import { runInPool, studyBudgetMs } from "./sim-pool";

/** Saved studies are read with the run; this one is for the study alone. */
export async function getRunStudyOrThrow({
  runId,
  teamId,
}: {
  runId: string;
  teamId: string;
}): Promise<SavedStudy | null> {
  const run = isId(runId)
    ? await getModels().Run.findOne({ where: { id: runId, teamId }, attributes: ["id", "study"] })
    : null;
  if (!run) throw notFound("No such run in your team.");
  return (run.study as SavedStudy | null) ?? null;
}

export async function saveRunStudy({
  runId,
  teamId,
  actorId,
  upload,
}: {
  runId: string;
  teamId: string;
  actorId: string;
  upload: StudyUpload;
}): Promise<SavedStudy> {
  const { Run } = getModels();
  const run = isId(runId) ? await Run.findOne({ where: { id: runId, teamId }, attributes: ["id", "scenario"] }) : null;
  if (!run) throw notFound("No such run in your team.");
  try {
    parseScenario(run.scenario);
  } catch (err) {
    if (err instanceof ScenarioError)
      throw new AppError("conflict", "This run's scenario snapshot no longer parses; re-run the scenario first.");
    throw err;
  }
  const { study: saved } = await runInPool({
    kind: "study",
    scenario: run.scenario,
    upload,
    budgetMs: studyBudgetMs(),
  });
  await getSequelize().transaction(async (transaction) => {
    await Run.update({ study: saved }, { where: { id: runId, teamId }, transaction });
    await recordAudit(
      {
        teamId,
        actorId,
        action: "run.study.saved",
        targetType: "run",
        targetId: runId,
        details: { noiseMargin: !!saved.noiseMargin, toleranceSpread: !!saved.toleranceSpread },
      },
      transaction,
    );
  });
  return saved;
}
