// One entry point for both studies, as the worker pool sees them: a study is a list of
// deterministic tasks; any contiguous range of them can run anywhere; outputs are merged in
// task order. Splitting the list differently never changes a single output.
import type { Scenario } from "@/lib/schemas/scenario";
import type { SimulateFn } from "@/lib/sim/types";
import type { DrawOutput, StudyConfig } from "@/lib/schemas/study";
import { noiseTaskCount, runNoiseTask, type NoiseTaskOutput } from "./noise-margin";
import { runToleranceTask, toleranceTaskCount } from "./tolerance-spread";

export interface StudyRequest {
  scenario: Scenario;
  config: StudyConfig;
}

export type TaskOutput = NoiseTaskOutput | DrawOutput;

export function studyTaskCount(config: StudyConfig): number {
  return config.kind === "noise-margin" ? noiseTaskCount(config) : toleranceTaskCount(config);
}

/** Run tasks [start, end) in order; `onTask` after each (for progress and cancel checks). */
export function runStudyTasks(
  request: StudyRequest,
  start: number,
  end: number,
  simulate: SimulateFn,
  onTask?: (done: number) => void,
): TaskOutput[] {
  const total = studyTaskCount(request.config);
  if (!(start >= 0 && end <= total && start <= end))
    throw new Error(`task range [${start}, ${end}) outside [0, ${total})`);
  const out: TaskOutput[] = [];
  for (let i = start; i < end; i++) {
    out.push(
      request.config.kind === "noise-margin"
        ? runNoiseTask(request.scenario, request.config, i, simulate)
        : runToleranceTask(request.scenario, request.config, i, simulate),
    );
    onTask?.(i - start + 1);
  }
  return out;
}

/** Contiguous [start, end) ranges of about `size` tasks covering the whole study. */
export function splitTasks(total: number, size: number): Array<[number, number]> {
  const step = Math.max(1, Math.floor(size));
  const ranges: Array<[number, number]> = [];
  for (let s = 0; s < total; s += step) ranges.push([s, Math.min(total, s + step)]);
  return ranges;
}

/** All tasks in this thread (tests, CLI, server spot checks), in ranges of `batch`. */
export function runStudyInProcess(request: StudyRequest, simulate: SimulateFn, batch = 64): TaskOutput[] {
  const out: TaskOutput[] = [];
  for (const [a, b] of splitTasks(studyTaskCount(request.config), batch))
    out.push(...runStudyTasks(request, a, b, simulate));
  return out;
}
