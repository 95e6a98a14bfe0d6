// Starting values for the two studies, suggested from the scenario (a sweep to half the
// deadband, a ±2 % window around each designed figure), and the study-config messages in the
// words of the study forms. Pure, no React.
import { conditionsOf, stageFigures } from "@/lib/design";
import type { Scenario } from "@/lib/schemas/scenario";
import type { CaptureNoiseEstimate } from "@/lib/studies/capture-noise";
import type { Measure } from "@/lib/schemas/study";
import { defaultMeasures } from "@/lib/studies/tolerance-spread";

/** Two significant figures, so suggested values read like ones an engineer would type. */
export function twoFigures(v: number): number {
  if (!(v > 0)) return v;
  const p = 10 ** (Math.floor(Math.log10(v)) - 1);
  return Math.round(v / p) * p;
}

export function suggestNoise(s: Scenario, capture: CaptureNoiseEstimate | null) {
  const f = stageFigures(s.stage, conditionsOf(s.opamp, s.supply));
  const deadband = f.hysteresis && f.hysteresis > 0 ? f.hysteresis : 0.01 * (s.supply.positive - s.supply.negative);
  // Sweep to half the deadband: far past the 6.6 × rms rule, so the edge shows on the chart.
  const rmsTo = twoFigures(deadband / 2);
  return {
    rmsFrom: twoFigures(rmsTo / 20),
    rmsTo,
    levels: 20,
    seedsPerLevel: 50,
    bandwidth: twoFigures(capture?.bandwidth ?? s.input.noise?.bandwidth ?? 1000 / s.run.duration),
    limit: 0.01,
    seed: 1,
  };
}

export function suggestTolerance(s: Scenario) {
  const f = stageFigures(s.stage, conditionsOf(s.opamp, s.supply));
  const measures = defaultMeasures(s.stage);
  const window: Partial<Record<Measure, [number, number]>> = {};
  const nominal: Partial<Record<Measure, number | null>> = {
    upperThreshold: f.upperThreshold,
    lowerThreshold: f.lowerThreshold,
    gain: f.gain,
    period: f.frequency ? 1 / f.frequency : null,
  };
  for (const m of measures) {
    const v = nominal[m];
    // A suggested ±2 % window around the designed figure; the form says where it came from.
    if (v !== null && v !== undefined && Number.isFinite(v))
      window[m] = [v - Math.abs(v) * 0.02, v + Math.abs(v) * 0.02];
  }
  return {
    draws: 1000,
    resistorTolerance: 0.01,
    offsetTolerance: Math.abs(s.opamp.inputOffset) || 1e-3,
    headroomSpread: 0.2,
    distribution: "uniform" as "uniform" | "normal",
    probe: "scenario" as "scenario" | "triangle",
    measures,
    window,
    seed: 1,
  };
}

export function inputRange(s: Scenario): [number, number] {
  const f = stageFigures(s.stage, conditionsOf(s.opamp, s.supply));
  const pts = [f.upperThreshold, f.lowerThreshold].filter((v): v is number => v !== null && Number.isFinite(v));
  if (pts.length === 0) return [s.supply.negative, s.supply.positive];
  const lo = Math.min(...pts),
    hi = Math.max(...pts);
  const pad = Math.max(0.25 * (hi - lo), 0.05 * (s.supply.positive - s.supply.negative));
  return [lo - pad, hi + pad];
}

/** The labels the study forms show, by config key. */
export const STUDY_FIELD_LABEL: Record<string, string> = {
  rmsFrom: "rms from",
  rmsTo: "rms to",
  levels: "levels",
  seedsPerLevel: "seeds per level",
  bandwidth: "bandwidth",
  limit: "chatter limit",
  seed: "study seed",
  draws: "draws",
  resistorTolerance: "resistors ±",
  offsetTolerance: "offset ±",
  headroomSpread: "headroom ±",
  window: "spec window",
};

/** Config messages ("seedsPerLevel must be at most 10000") in the form's words ("seeds per level must be at most 10000"). */
export function studyIssueText(issues: readonly { message: string; path?: readonly PropertyKey[] }[]): string {
  return issues
    .slice(0, 3)
    .map((i) => {
      let text = i.message;
      for (const [key, label] of Object.entries(STUDY_FIELD_LABEL))
        text = text.replace(new RegExp(`\\b${key}\\b`, "g"), `“${label}”`);
      return text;
    })
    .join("; ");
}
