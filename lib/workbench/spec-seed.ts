// The From spec form's starting values: the scenario's stored `spec` (the spec it was designed
// from, lib/schemas/README.md § The circuit as built) when it has one the form can show, else defaults
// around the middle of the supply. Also the reverse: the spec to store when a design is applied.
import type { Scenario, StageKind } from "@/lib/schemas/scenario";
import type { DesignSpecInput } from "@/lib/schemas/design";
import { SERIES_TOLERANCE, type SeriesName } from "@/lib/design/eseries";

/** How the form takes its thresholds: as input volts, through a divider or an NTC divider. */
export type SpecSensor =
  | { kind: "volts" }
  | { kind: "divider"; rTop: number; rBottom: number }
  | { kind: "ntc"; r25: number; beta: number; rFixed: number; position: "top" | "bottom"; vSupply: number };

export interface SpecForm {
  kind: StageKind;
  upper: number;
  lower: number;
  threshold: number;
  gain: number;
  frequency: number;
  duty: number | undefined;
  series: SeriesName;
  tolerancePct: number;
  referenceAuto: boolean;
  reference: number;
  inputAt: "noninverting" | "inverting";
}

export interface SpecSeed {
  form: SpecForm;
  sensor: SpecSensor;
  /** The stored spec's name, when the form was seeded from it. */
  from: string | null;
}

/** Defaults: ±10 % of the span around mid-supply, E24 at its tolerance, the stage's reference. */
export function defaultSpecForm(s: Scenario): SpecForm {
  const span = s.supply.positive - s.supply.negative;
  const mid = s.supply.negative + span / 2;
  return {
    kind: s.stage.kind,
    upper: mid + span * 0.1,
    lower: mid - span * 0.1,
    threshold: mid,
    gain: 10,
    frequency: 1,
    duty: undefined,
    series: "E24",
    tolerancePct: 100 * SERIES_TOLERANCE.E24,
    referenceAuto: false,
    reference: s.stage.reference,
    inputAt: "noninverting",
  };
}

/**
 * The form seeded from `scenario.spec`. A sensor the form cannot show (linear, or an NTC given
 * by Steinhart–Hart coefficients or three points) keeps the defaults, so no value is shown in
 * the wrong unit; `from` is then null.
 */
export function specSeed(s: Scenario): SpecSeed {
  const base: SpecSeed = { form: defaultSpecForm(s), sensor: { kind: "volts" }, from: null };
  const spec = s.spec;
  if (!spec) return base;
  let sensor: SpecSensor = { kind: "volts" };
  const sn = spec.sensor;
  if (sn) {
    if (sn.kind === "divider") sensor = { kind: "divider", rTop: sn.rTop, rBottom: sn.rBottom };
    else if (sn.kind === "ntc" && "beta" in sn.model && sn.model.t0 === undefined) {
      sensor = {
        kind: "ntc",
        r25: sn.model.r25,
        beta: sn.model.beta,
        rFixed: sn.rFixed,
        position: sn.position,
        vSupply: sn.supplyVoltage ?? spec.supply.positive,
      };
    } else return base;
  }
  const t = spec.target as Record<string, number | undefined>;
  const f = { ...base.form, kind: spec.kind };
  if (t.upperThreshold !== undefined) f.upper = t.upperThreshold;
  if (t.lowerThreshold !== undefined) f.lower = t.lowerThreshold;
  if (t.threshold !== undefined) f.threshold = t.threshold;
  if (t.gain !== undefined) f.gain = t.gain;
  if (t.frequency !== undefined) f.frequency = t.frequency;
  if (t.duty !== undefined) f.duty = t.duty;
  if (spec.series) f.series = spec.series as SeriesName;
  if (spec.tolerance !== undefined) f.tolerancePct = 100 * spec.tolerance;
  else if (spec.series) f.tolerancePct = 100 * SERIES_TOLERANCE[spec.series as SeriesName];
  if (spec.reference === "auto") f.referenceAuto = true;
  else if (typeof spec.reference === "number") {
    f.referenceAuto = false;
    f.reference = spec.reference;
  }
  if (spec.inputAt) f.inputAt = spec.inputAt;
  return { form: f, sensor, from: spec.name ?? "the stored spec" };
}

/** The sensor as the design-spec contract writes it (null for plain input volts). */
export function sensorOfSetup(s: SpecSensor): NonNullable<DesignSpecInput["sensor"]> | null {
  if (s.kind === "divider") return { kind: "divider", rTop: s.rTop, rBottom: s.rBottom };
  if (s.kind === "ntc")
    return {
      kind: "ntc",
      model: { beta: s.beta, r25: s.r25 },
      rFixed: s.rFixed,
      position: s.position,
      supplyVoltage: s.vSupply,
    };
  return null;
}
