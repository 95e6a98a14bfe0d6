// A study as stored with a run (`runs.study`): the uploaded raw task outputs plus summaries
// recomputed here — on the server — so a saved figure is never one the client made up.
import type { Scenario } from "@/lib/schemas/scenario";
import type { SimulateFn } from "@/lib/sim/types";
import type { DrawOutput, SavedStudy, StudyUpload } from "@/lib/schemas/study";
import { noiseTaskCount, runNoiseTask, summarizeNoiseMargin, type NoiseTaskOutput } from "./noise-margin";
import { runToleranceTask, summarizeToleranceSpread, toleranceTaskCount, type Corners } from "./tolerance-spread";

export type { SavedStudy } from "@/lib/schemas/study";

export class StudyMismatch extends Error {
  constructor(
    message: string,
    readonly field: string,
  ) {
    super(message);
    this.name = "StudyMismatch";
  }
}

function sameNumber(a: number | null, b: number | null): boolean {
  if (a === null || b === null) return a === b;
  // The core is deterministic bit for bit; allow for nothing but last-digit JSON round-off.
  return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
}

function sameOutput(a: NoiseTaskOutput | DrawOutput, b: NoiseTaskOutput | DrawOutput): boolean {
  return Object.keys(a).every((k) =>
    sameNumber((a as unknown as Record<string, number | null>)[k], (b as unknown as Record<string, number | null>)[k]),
  );
}

/**
 * Check task counts, re-simulate task 0 and `spotChecks` more tasks chosen by `pick`, and
 * build the stored form. Throws StudyMismatch naming the field when the upload does not hold.
 */
export function buildSavedStudy(
  scenario: Scenario,
  upload: StudyUpload,
  simulate: SimulateFn,
  options: { spotChecks?: number; pick?: (count: number) => number; corners?: Corners } = {},
): SavedStudy {
  const spot = options.spotChecks ?? 3;
  const pick = options.pick ?? ((count: number) => Math.floor(Math.random() * count));
  const saved: SavedStudy = { schema: "railwise.study/1" };
  const indices = (count: number) => {
    const set = new Set<number>([0]);
    for (let i = 0; i < spot && set.size < count; i++) set.add(1 + pick(count - 1));
    return [...set];
  };
  if (upload.noiseMargin) {
    const { config, tasks } = upload.noiseMargin;
    const want = noiseTaskCount(config);
    if (tasks.length !== want)
      throw new StudyMismatch(
        `noiseMargin.tasks must hold ${want} outputs (1 reference + levels × seedsPerLevel), got ${tasks.length}`,
        "noiseMargin.tasks",
      );
    for (const i of indices(want)) {
      if (!sameOutput(runNoiseTask(scenario, config, i, simulate), tasks[i])) {
        throw new StudyMismatch(
          `noiseMargin.tasks[${i}] does not match a re-run on this run's scenario`,
          `noiseMargin.tasks.${i}`,
        );
      }
    }
    saved.noiseMargin = { ...upload.noiseMargin, summary: summarizeNoiseMargin(config, tasks) };
  }
  if (upload.toleranceSpread) {
    const { config, tasks } = upload.toleranceSpread;
    const want = toleranceTaskCount(config);
    if (tasks.length !== want)
      throw new StudyMismatch(
        `toleranceSpread.tasks must hold ${want} outputs (1 nominal + draws), got ${tasks.length}`,
        "toleranceSpread.tasks",
      );
    for (const i of indices(want)) {
      if (!sameOutput(runToleranceTask(scenario, config, i, simulate), tasks[i])) {
        throw new StudyMismatch(
          `toleranceSpread.tasks[${i}] does not match a re-run on this run's scenario`,
          `toleranceSpread.tasks.${i}`,
        );
      }
    }
    saved.toleranceSpread = {
      ...upload.toleranceSpread,
      summary: summarizeToleranceSpread(config, tasks, options.corners),
    };
  }
  return saved;
}
