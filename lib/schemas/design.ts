// The `railwise.design-spec/1` contract (DESIGN.md) with Railwise's extensions: comparator
// `{ threshold }`, oscillator `{ frequency, duty? }`, resistor `range`, `maxError`, spread settings.
// All values in SI base units. Messages name the field.
import { z } from "zod";
import { opampSchema, supplySchema, STAGE_KINDS, type StageKind } from "./scenario";

export const DESIGN_SPEC_SCHEMA_ID = "railwise.design-spec/1";
export const DESIGN_SCHEMA_ID = "railwise.design/1";

const SERIES = ["E6", "E12", "E24", "E48", "E96", "E192"] as const;

const finite = (what: string) =>
  z.number({ error: `${what} must be a number` }).refine(Number.isFinite, { message: `${what} must be finite` });

const volts = (what: string) =>
  finite(what).refine((v) => Math.abs(v) <= 1000, { message: `${what} must be within ±1000 V` });

const fraction = (what: string, max: number) =>
  finite(what).refine((v) => v >= 0 && v <= max, {
    message: `${what} must be a fraction between 0 and ${max} (e.g. 0.01 for 1 %)`,
  });

const rangeSchema = (what: string, unit: string, lo: number, hi: number) =>
  z
    .strictObject({
      min: finite(`${what}.min`).refine((v) => v >= lo && v <= hi, { message: `${what}.min must lie between ${lo} and ${hi} ${unit}` }),
      max: finite(`${what}.max`).refine((v) => v >= lo && v <= hi, { message: `${what}.max must lie between ${lo} and ${hi} ${unit}` }),
    })
    .refine((r) => r.max > r.min, { message: `${what}.max must be above ${what}.min`, path: ["max"] });

export const designTargetSchema = z.strictObject({
  upperThreshold: volts("target.upperThreshold").optional(),
  lowerThreshold: volts("target.lowerThreshold").optional(),
  threshold: volts("target.threshold").optional(),
  gain: finite("target.gain").optional(),
  frequency: finite("target.frequency (Hz)")
    .refine((v) => v > 0 && v <= 1e7, { message: "target.frequency must be above 0 and at most 10 MHz" })
    .optional(),
  duty: finite("target.duty")
    .refine((v) => v > 0 && v < 1, { message: "target.duty must lie strictly between 0 and 1" })
    .optional(),
});

const pos = (what: string) =>
  finite(what).refine((v) => v > 0, { message: `${what} must be greater than 0` });
const celsius = (what: string) =>
  finite(what).refine((v) => v > -273.15 && v < 1000, { message: `${what} must be a temperature in °C above −273.15` });

/** NTC curve: Beta (with R at t0 °C, default 25 °C), Steinhart–Hart coefficients, or three [°C, Ω] points to fit. */
export const ntcModelSchema = z.union(
  [
    z.strictObject({ beta: pos("sensor.model.beta (K)"), r25: pos("sensor.model.r25 (Ω)"), t0: celsius("sensor.model.t0 (°C)").optional() }),
    z.strictObject({ a: finite("sensor.model.a"), b: pos("sensor.model.b"), c: finite("sensor.model.c").refine((v) => v >= 0, { message: "sensor.model.c must not be negative" }) }),
    z.strictObject({
      points: z
        .array(z.tuple([celsius("sensor.model.points temperature (°C)"), pos("sensor.model.points resistance (Ω)")]), {
          error: "sensor.model.points must be three [°C, Ω] pairs",
        })
        .length(3, { message: "sensor.model.points must hold exactly three [°C, Ω] pairs" }),
    }),
  ],
  { error: "sensor.model must be { beta, r25, t0? }, { a, b, c } (Steinhart–Hart) or { points: [[°C, Ω] × 3] }" },
);

/**
 * Optional sensor in front of the stage: the target thresholds are then in the sensor's units
 * (°C for an NTC, the measured unit for a linear sensor, source volts for a divider).
 */
export const sensorSchema = z.discriminatedUnion(
  "kind",
  [
    z.strictObject({
      kind: z.literal("ntc"),
      model: ntcModelSchema,
      rFixed: pos("sensor.rFixed (Ω)"),
      position: z.enum(["top", "bottom"], { error: 'sensor.position must be "top" or "bottom" (where the NTC sits)' }),
      /** Divider supply (V); default supply.positive. */
      supplyVoltage: pos("sensor.supplyVoltage (V)").optional(),
      /** Dissipation constant δ (W/K) for the self-heating check. */
      dissipationConstant: pos("sensor.dissipationConstant (W/K)").optional(),
      /** Accuracy wanted (K); self-heating above a quarter of it is flagged. Default 0.5 K. */
      accuracy: pos("sensor.accuracy (K)").optional(),
    }),
    z.strictObject({
      kind: z.literal("linear"),
      voltsPerUnit: finite("sensor.voltsPerUnit").refine((v) => v !== 0, { message: "sensor.voltsPerUnit must not be 0" }),
      offset: volts("sensor.offset"),
      unit: z.string().max(20, { message: "sensor.unit must be at most 20 characters" }).optional(),
    }),
    z.strictObject({ kind: z.literal("divider"), rTop: pos("sensor.rTop (Ω)"), rBottom: pos("sensor.rBottom (Ω)") }),
  ],
  { error: 'sensor.kind must be "ntc", "linear" or "divider"' },
);

export const designSpecSchema = z
  .strictObject({
    schema: z.literal(DESIGN_SPEC_SCHEMA_ID, { error: `schema must be "${DESIGN_SPEC_SCHEMA_ID}"` }),
    name: z.string().max(200, { message: "name must be at most 200 characters" }).optional(),
    kind: z.enum(STAGE_KINDS as [StageKind, ...StageKind[]], {
      error: `kind must be one of ${STAGE_KINDS.join(", ")}`,
    }),
    supply: supplySchema,
    opamp: opampSchema,
    target: designTargetSchema,
    series: z.enum(SERIES, { error: `series must be one of ${SERIES.join(", ")}` }),
    /** Resistor tolerance; defaults to the series' usual tolerance. */
    tolerance: fraction("tolerance", 0.2).optional(),
    reference: z.union([volts("reference"), z.literal("auto")], { error: 'reference must be a voltage or "auto"' }).optional(),
    /** Comparator only: the pin the input drives. */
    inputAt: z.enum(["noninverting", "inverting"], { error: 'inputAt must be "noninverting" or "inverting"' }).optional(),
    /** Practical resistor range (Ω); default 1 kΩ–1 MΩ. */
    range: rangeSchema("range", "Ω", 0.1, 1e9).optional(),
    /** Oscillator timing capacitor: series (default E6), range (default 100 pF–10 µF), tolerance (default 0.05). */
    capacitorSeries: z.enum(SERIES, { error: `capacitorSeries must be one of ${SERIES.join(", ")}` }).optional(),
    capacitorRange: rangeSchema("capacitorRange", "F", 1e-13, 1).optional(),
    capacitorTolerance: fraction("capacitorTolerance", 0.5).optional(),
    /** Largest relative error accepted for an ideal (continuous) solution, and the spec window ± for the spread. */
    maxError: finite("maxError")
      .refine((v) => v > 0 && v <= 0.5, { message: "maxError must be above 0 and at most 0.5" })
      .optional(),
    /** Share of each nominal output headroom that the worst case sweeps (± this fraction); default 0.2. */
    headroomSpread: fraction("headroomSpread", 1).optional(),
    sensor: sensorSchema.optional(),
    monteCarlo: z
      .union([
        z.literal(false),
        z.strictObject({
          draws: z
            .number({ error: "monteCarlo.draws must be a whole number" })
            .int({ message: "monteCarlo.draws must be a whole number" })
            .min(1, { message: "monteCarlo.draws must be at least 1" })
            .max(100_000, { message: "monteCarlo.draws must be at most 100,000" })
            .optional(),
          seed: z
            .number({ error: "monteCarlo.seed must be a whole number" })
            .int({ message: "monteCarlo.seed must be a whole number" })
            .min(0, { message: "monteCarlo.seed must not be negative" })
            .max(4294967295, { message: "monteCarlo.seed must fit in 32 bits" })
            .optional(),
          distribution: z.enum(["uniform", "normal"], { error: 'monteCarlo.distribution must be "uniform" or "normal"' }).optional(),
          bins: z.number().int().min(1).max(200, { message: "monteCarlo.bins must be at most 200" }).optional(),
        }),
      ])
      .optional(),
  })
  .superRefine((s, ctx) => {
    const issue = (path: (string | number)[], message: string) => ctx.addIssue({ code: "custom", path, message });
    const span = s.supply.positive - s.supply.negative;
    if (s.opamp.outputHeadroomHigh + s.opamp.outputHeadroomLow >= span) {
      issue(["opamp", "outputHeadroomHigh"], `outputHeadroomHigh + outputHeadroomLow must be smaller than the supply span (${span} V)`);
    }
    if (typeof s.reference === "number" && (s.reference > s.supply.positive || s.reference < s.supply.negative)) {
      issue(["reference"], `reference (${s.reference} V) must lie within the supplies (${s.supply.negative} V … ${s.supply.positive} V)`);
    }
    const t = s.target;
    const has = (k: keyof typeof t) => t[k] !== undefined;
    const only = (allowed: (keyof typeof t)[]) => {
      for (const k of Object.keys(t) as (keyof typeof t)[]) {
        if (!allowed.includes(k)) issue(["target", k], `target.${k} does not apply to ${s.kind} (use ${allowed.join(", ")})`);
      }
    };
    switch (s.kind) {
      case "schmitt-inverting":
      case "schmitt-noninverting":
        only(["upperThreshold", "lowerThreshold"]);
        if (!has("upperThreshold")) issue(["target", "upperThreshold"], "target.upperThreshold is required for a Schmitt trigger");
        if (!has("lowerThreshold")) issue(["target", "lowerThreshold"], "target.lowerThreshold is required for a Schmitt trigger");
        if (has("upperThreshold") && has("lowerThreshold") && t.upperThreshold! <= t.lowerThreshold!) {
          issue(
            ["target", "upperThreshold"],
            `target.upperThreshold (${t.upperThreshold} V) must be above target.lowerThreshold (${t.lowerThreshold} V): the deadband needs a positive width`,
          );
        }
        break;
      case "comparator":
        only(["threshold", "upperThreshold", "lowerThreshold"]);
        if (has("threshold")) {
          for (const k of ["upperThreshold", "lowerThreshold"] as const)
            if (has(k) && t[k] !== t.threshold) issue(["target", k], `target.${k} must equal target.threshold for a comparator`);
        } else if (!has("upperThreshold") || !has("lowerThreshold")) {
          issue(["target", "threshold"], "target.threshold (or equal upperThreshold and lowerThreshold) is required for a comparator");
        } else if (t.upperThreshold !== t.lowerThreshold) {
          issue(
            ["target", "upperThreshold"],
            "a comparator has no hysteresis: target.upperThreshold must equal target.lowerThreshold (use schmitt-noninverting or schmitt-inverting for a deadband)",
          );
        }
        break;
      case "noninverting-amplifier":
        only(["gain"]);
        if (!has("gain")) issue(["target", "gain"], "target.gain is required for an amplifier");
        else if (!(t.gain! > 1 && t.gain! <= 1e5))
          issue(["target", "gain"], `target.gain (${t.gain}) must be above 1 and at most 100000 for a non-inverting amplifier (a gain of 1 is a follower and needs no resistors)`);
        if (s.reference === "auto")
          issue(["reference"], 'reference "auto" is not offered for the non-inverting amplifier: rGround returns its current into the reference, so give a buffered reference voltage');
        break;
      case "inverting-amplifier":
        only(["gain"]);
        if (!has("gain")) issue(["target", "gain"], "target.gain is required for an amplifier");
        else if (!(Math.abs(t.gain!) > 0 && Math.abs(t.gain!) <= 1e5))
          issue(["target", "gain"], `target.gain (${t.gain}) must be non-zero with a magnitude of at most 100000 (−10 and 10 both mean an inverting gain of −10)`);
        break;
      case "relaxation-oscillator":
        only(["frequency", "duty"]);
        if (!has("frequency")) issue(["target", "frequency"], "target.frequency is required for a relaxation oscillator");
        break;
    }
    if (s.inputAt !== undefined && s.kind !== "comparator") issue(["inputAt"], "inputAt applies to the comparator only");
    if (s.sensor && !["comparator", "schmitt-inverting", "schmitt-noninverting"].includes(s.kind))
      issue(["sensor"], "a sensor applies to threshold stages only (comparator, schmitt-inverting, schmitt-noninverting)");
  });

export type DesignSpec = z.infer<typeof designSpecSchema>;
export type DesignSpecInput = z.input<typeof designSpecSchema>;
export type DesignTarget = DesignSpec["target"];
export type DesignSensor = NonNullable<DesignSpec["sensor"]>;
