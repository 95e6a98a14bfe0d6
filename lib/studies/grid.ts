// The output grid of study tasks.
/**
 * Output points of a study task. Transitions, thresholds and period come from the solver's
 * located events, which do not depend on the output grid (DEVELOPERS.md § Behavioural op-amp model: results must not
 * depend on it; checked in tests/unit/studies-split.test.ts), so a task whose figures are all
 * event-based samples its output on this coarse grid instead of the scenario's. The solver
 * still integrates the whole run; only the sampled copy of the waveform is smaller.
 */
export const STUDY_OUTPUT_POINTS = 257;

export function studyRunSettings<R extends { points: number }>(run: R, needsSamples: boolean): R {
  return needsSamples || run.points <= STUDY_OUTPUT_POINTS ? run : { ...run, points: STUDY_OUTPUT_POINTS };
}
