// Starting values for the two studies, suggested from the scenario (a sweep to half the
// deadband, a ±2 % window around each designed figure), and the study-config messages in the
// words of the study forms. Pure, no React.
import { conditionsOf, stageFigures } from "@/lib/design";
import type { Scenario } from "@/lib/schemas/scenario";
import type { CaptureNoiseEstimate } from "@/lib/studies/capture-noise";
import type { Measure } from "@/lib/schemas/study";
import { defaultMeasures } from "@/lib/studies/tolerance-spread";
import { escapeRegExp } from "./screen-words";

/** The suggested spec window: ± this fraction around each figure designed from the stage's parts. */
export const SUGGESTED_WINDOW = 0.02;

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
    // A suggested window around the designed figure; the form says where it came from.
    if (v !== null && v !== undefined && Number.isFinite(v))
      window[m] = [v - Math.abs(v) * SUGGESTED_WINDOW, v + Math.abs(v) * SUGGESTED_WINDOW];
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

/** Names of the figures a tolerance spread measures, as the study form and readouts show them. */
export const MEASURE_LABEL: Record<Measure, string> = {
  upperThreshold: "Upper threshold",
  lowerThreshold: "Lower threshold",
  gain: "Gain",
  period: "Period",
};
export const MEASURE_UNIT: Record<Measure, string> = {
  upperThreshold: "V",
  lowerThreshold: "V",
  gain: "",
  period: "s",
};

/** The labels the study forms show, by config key. */
export const STUDY_FIELD_LABEL = {
  rmsFrom: "rms from",
  rmsTo: "rms to",
  levels: "levels",
  seedsPerLevel: "seeds per level",
  bandwidth: "bandwidth",
  limit: "chatter limit",
  seed: "study seed",
  draws: "draws",
  resistorTolerance: "resistors ±",
  capacitorTolerance: "capacitors ±",
  offsetTolerance: "offset ±",
  headroomSpread: "headroom ±",
  window: "spec window",
} as const;
type StudyField = keyof typeof STUDY_FIELD_LABEL;

/**
 * Each field's rule as the form shows it, in the form's units (percent where the form shows a
 * percentage; the config holds fractions). The same bounds as lib/schemas/study.ts.
 * `v` is the number typed into the field.
 */
export function studyRule(field: StudyField, v: number): string | null {
  const whole = (min: number, max: number) =>
    Number.isInteger(v) && v >= min && v <= max ? null : `a whole number ${min} … ${max.toLocaleString("en")}`;
  switch (field) {
    case "rmsFrom":
      return v >= 0 ? null : "must not be negative";
    case "rmsTo":
      return v > 0 && v <= 1000 ? null : "above 0, at most 1000 V";
    case "levels":
      return whole(2, 200);
    case "seedsPerLevel":
      return whole(1, 10_000);
    case "bandwidth":
      return v > 0 && v <= 1e11 ? null : "above 0, at most 100 GHz";
    case "limit":
      return v > 0 && v < 100 ? null : "above 0 % and below 100 %";
    case "seed":
      return Number.isInteger(v) && v >= 0 && v <= 4294967295 ? null : "a whole number, 32 bits";
    case "draws":
      return whole(1, 20_000);
    case "resistorTolerance":
    case "capacitorTolerance":
      return v >= 0 && v <= 50 ? null : "0 … 50 %";
    case "offsetTolerance":
      return v >= 0 && v <= 1 ? null : "0 … 1 V";
    case "headroomSpread":
      return v >= 0 && v <= 100 ? null : "0 … 100 %";
    case "window":
      return null;
  }
}

/** Fields the schema checks as fractions while the form shows percent: their message is the form's own. */
const PERCENT_RULE: Partial<Record<StudyField, string>> = {
  limit: "must be above 0 % and below 100 %",
  resistorTolerance: "must be between 0 and 50 %",
  capacitorTolerance: "must be between 0 and 50 %",
  headroomSpread: "must be between 0 and 100 %",
};

/**
 * Config messages ("seedsPerLevel must be at most 10000", "rmsTo must be above rmsFrom") in the
 * form's words ("“seeds per level” must be at most 10000", "“rms to” must be above “rms from”"),
 * a spec window by the labels of its two fields, and percent rules in percent.
 */
export function studyIssueText(issues: readonly { message: string; path?: readonly PropertyKey[] }[]): string {
  return issues
    .slice(0, 3)
    .map((i) => {
      const key = String(i.path?.[0] ?? "") as StudyField;
      const percent = PERCENT_RULE[key];
      if (percent && !/whole|number/.test(i.message)) return `“${STUDY_FIELD_LABEL[key]}” ${percent}`;
      let text = i.message;
      for (const m of Object.keys(MEASURE_LABEL) as Measure[]) {
        const l = MEASURE_LABEL[m];
        text = text
          .replace(`window.${m} maximum must be above its minimum`, `“${l} max” must be above “${l} min”`)
          .replace(new RegExp(`window\\.${m} (minimum|maximum)`, "g"), (_, end: string) =>
            end === "minimum" ? `“${l} min”` : `“${l} max”`,
          )
          .replace(new RegExp(`window\\.${m}\\b`, "g"), `the ${l.toLowerCase()} window`);
      }
      for (const [k, label] of Object.entries(STUDY_FIELD_LABEL))
        text = text.replace(
          new RegExp(`(?<![\\w.])${escapeRegExp(k)}(?: \\((?:V|Hz|s)\\))?(?![\\w])`, "g"),
          `“${label}”`,
        );
      return text;
    })
    .join("; ");
}
