import "server-only";
// Studies stored with their run (runs.study). The client uploads the configuration and the raw
// per-task outputs; here the summaries are recomputed and a few tasks re-simulated on the run's
// own scenario snapshot, so a saved study holds no number the client made up.
import { getModels, getSequelize } from "@/models";
import { parseScenario, ScenarioError } from "@/lib/schemas/scenario";
import { simulate } from "@/lib/sim";
import { buildSavedStudy, StudyMismatch, type SavedStudy, type StudyUpload } from "@/lib/studies";
import { studyCorners } from "@/lib/studies/corners";
import { recordAudit } from "./audit";
import { AppError, badRequest, notFound } from "./errors";

/** Saved studies are read with the run; this one is for the study alone. */
export async function getRunStudyOrThrow({ runId, teamId }: { runId: string; teamId: string }): Promise<SavedStudy | null> {
  const run = await getModels().Run.findOne({ where: { id: runId, teamId }, attributes: ["id", "study"] });
  if (!run) throw notFound("No such run in your team.");
  return (run.study as SavedStudy | null) ?? null;
}

export async function saveRunStudy({ runId, teamId, actorId, upload }: { runId: string; teamId: string; actorId: string; upload: StudyUpload }): Promise<SavedStudy> {
  const { Run } = getModels();
  const run = await Run.findOne({ where: { id: runId, teamId }, attributes: ["id", "scenario"] });
  if (!run) throw notFound("No such run in your team.");
  let scenario;
  try {
    scenario = parseScenario(run.scenario);
  } catch (err) {
    if (err instanceof ScenarioError) throw new AppError(409, "conflict", "This run's scenario snapshot no longer parses; re-run the scenario first.");
    throw err;
  }
  let saved: SavedStudy;
  try {
    saved = buildSavedStudy(scenario, upload, simulate, { corners: studyCorners(scenario, upload.toleranceSpread?.config) });
  } catch (err) {
    if (err instanceof StudyMismatch) {
      throw badRequest(`${err.message}. Run the study again on this run's scenario before saving.`, [{ path: err.field.split("."), message: err.message }]);
    }
    throw err;
  }
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
