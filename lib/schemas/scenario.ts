// The `railwise.scenario/1` contract (lib/schemas/README.md). All values in SI base units.
// Shared by the API, the simulator, the CLIs and the workbench form.
import { z } from "zod";
import { finite, MAX_ABS_VOLTS, nonNegative, positive, volts } from "./units";

const ohms = (what: string) =>
  finite(what)
    .refine((v) => v > 0, { message: `${what} must be a positive resistance in Ω` })
    .refine((v) => v <= 1e12, { message: `${what} must be at most 1 TΩ` });

const fraction = (what: string, max: number) =>
  finite(what).refine((v) => v >= 0 && v <= max, {
    message: `${what} must be a fraction between 0 and ${max} (e.g. 0.01 for 1 %)`,
  });

export const supplySchema = z
  .object({
    positive: volts("supply.positive"),
    negative: volts("supply.negative"),
    /** ± on both rails (fraction), for the worst case and the tolerance spread. */
    tolerance: fraction("supply.tolerance", 0.5).optional(),
  })
  .refine((s) => s.positive > s.negative, {
    message: "supply.positive must be above supply.negative",
    path: ["positive"],
  });

export const opampSchema = z.object({
  openLoopGain: positive("openLoopGain", 1e10).refine((v) => v >= 1, {
    message: "openLoopGain must be at least 1 V/V",
  }),
  gainBandwidth: positive("gainBandwidth (Hz)", 1e11),
  slewRate: positive("slewRate (V/s)", 1e12),
  slewRateFall: positive("slewRateFall (V/s)", 1e12).optional(),
  outputHeadroomHigh: nonNegative("outputHeadroomHigh (V)", MAX_ABS_VOLTS),
  outputHeadroomLow: nonNegative("outputHeadroomLow (V)", MAX_ABS_VOLTS),
  inputOffset: finite("inputOffset (V)").refine((v) => Math.abs(v) <= 1, {
    message: "inputOffset must be within ±1 V",
  }),
  propagationDelay: nonNegative("propagationDelay (s)", 1).optional(),
});

// `reference` is optional on input: absent means 0 V, or (with `referenceDivider`) the divider's
// open-circuit voltage, which the parse fills in so every consumer reads a number (likewise
// rReference = the divider's Thevenin resistance for schmitt-inverting and the oscillator).
// Exactly one of reference / referenceDivider is given; a stored scenario echoes the filled values,
// which are accepted when they match the divider.
const reference = volts("reference").optional();

const dividerEnd = (what: string) => volts(what);

export const referenceDividerSchema = z.strictObject({
  rTop: ohms("referenceDivider.rTop"),
  rBottom: ohms("referenceDivider.rBottom"),
  /** Default "positive": the supply rail, so the reference follows the supply. */
  top: z
    .union([z.literal("positive"), dividerEnd("referenceDivider.top")], {
      error: 'referenceDivider.top must be "positive" or a voltage',
    })
    .optional(),
  /** Default "ground" (0 V). */
  bottom: z
    .union([z.literal("negative"), z.literal("ground"), dividerEnd("referenceDivider.bottom")], {
      error: 'referenceDivider.bottom must be "negative", "ground" or a voltage',
    })
    .optional(),
});
const referenceDivider = referenceDividerSchema.optional();

export const stageSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({
      kind: z.literal("noninverting-amplifier"),
      rGround: ohms("rGround"),
      rFeedback: ohms("rFeedback"),
      reference,
      referenceDivider,
    }),
    z.object({
      kind: z.literal("inverting-amplifier"),
      rInput: ohms("rInput"),
      rFeedback: ohms("rFeedback"),
      reference,
      referenceDivider,
    }),
    z.object({
      kind: z.literal("comparator"),
      reference,
      referenceDivider,
      inputAt: z
        .enum(["noninverting", "inverting"], { error: 'inputAt must be "noninverting" or "inverting"' })
        .default("noninverting"),
    }),
    z.object({
      kind: z.literal("schmitt-noninverting"),
      rInput: ohms("rInput"),
      rFeedback: ohms("rFeedback"),
      reference,
      referenceDivider,
    }),
    z.object({
      kind: z.literal("schmitt-inverting"),
      rReference: ohms("rReference").optional(),
      rFeedback: ohms("rFeedback"),
      reference,
      referenceDivider,
    }),
    z.object({
      kind: z.literal("relaxation-oscillator"),
      rReference: ohms("rReference").optional(),
      rFeedback: ohms("rFeedback"),
      rTiming: ohms("rTiming"),
      cTiming: positive("cTiming (F)", 1),
      reference,
      referenceDivider,
    }),
  ],
  {
    error:
      "stage.kind must be one of noninverting-amplifier, inverting-amplifier, comparator, schmitt-noninverting, schmitt-inverting, relaxation-oscillator",
  },
);

const timeValuePoints = (what: string, strict: boolean) =>
  z
    .array(z.tuple([finite(`${what} time`), volts(`${what} value`)]), {
      error: `${what} must be a list of [t, v] pairs`,
    })
    .min(strict ? 2 : 1, { message: `${what} needs at least ${strict ? 2 : 1} point(s)` })
    .max(1_000_000, { message: `${what} may hold at most 1,000,000 points` })
    .superRefine((pts, ctx) => {
      for (let i = 1; i < pts.length; i++) {
        const bad = strict ? pts[i][0] <= pts[i - 1][0] : pts[i][0] < pts[i - 1][0];
        if (bad) {
          ctx.addIssue({
            code: "custom",
            path: [i, 0],
            message: `${what} time must be ${strict ? "strictly increasing" : "non-decreasing"} (point ${i})`,
          });
          return;
        }
      }
    });

export const componentSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({ kind: z.literal("dc"), level: volts("dc.level") }),
    z.object({
      kind: z.literal("sine"),
      amplitude: nonNegative("sine.amplitude", MAX_ABS_VOLTS),
      frequency: positive("sine.frequency", 1e10),
      phase: finite("sine.phase (degrees)").default(0),
      offset: volts("sine.offset").default(0),
    }),
    z.object({
      kind: z.literal("triangle"),
      amplitude: nonNegative("triangle.amplitude", MAX_ABS_VOLTS),
      frequency: positive("triangle.frequency", 1e10),
      phase: finite("triangle.phase (degrees)").default(0),
      offset: volts("triangle.offset").default(0),
    }),
    z.object({
      kind: z.literal("ramp"),
      from: volts("ramp.from"),
      to: volts("ramp.to"),
      start: nonNegative("ramp.start"),
      duration: nonNegative("ramp.duration"),
    }),
    z
      .object({
        kind: z.literal("pulse"),
        low: volts("pulse.low"),
        high: volts("pulse.high"),
        period: positive("pulse.period"),
        duty: finite("pulse.duty").refine((d) => d >= 0 && d <= 1, { message: "pulse.duty must be between 0 and 1" }),
        rise: nonNegative("pulse.rise").default(0),
        fall: nonNegative("pulse.fall").default(0),
        delay: nonNegative("pulse.delay").default(0),
      })
      .refine((p) => p.rise + p.fall <= p.period, {
        message: "pulse.rise + pulse.fall must fit in pulse.period",
        path: ["rise"],
      }),
    z.object({ kind: z.literal("pwl"), points: timeValuePoints("pwl.points", false) }),
    z.object({ kind: z.literal("capture"), samples: timeValuePoints("capture.samples", true) }),
  ],
  { error: "input component kind must be one of dc, sine, triangle, ramp, pulse, pwl, capture" },
);

export const noiseSchema = z.object({
  rms: nonNegative("noise.rms (V)", MAX_ABS_VOLTS),
  bandwidth: positive("noise.bandwidth (Hz)", 1e11),
  seed: z
    .number({ error: "noise.seed must be a whole number" })
    .int({ message: "noise.seed must be a whole number" })
    .min(0, { message: "noise.seed must not be negative" })
    .max(4294967295, { message: "noise.seed must fit in 32 bits" }),
});

export const runSettingsSchema = z.object({
  duration: positive("run.duration (s)", 1e6),
  points: z
    .number({ error: "run.points must be a whole number" })
    .int({ message: "run.points must be a whole number" })
    .min(2, { message: "run.points must be at least 2" })
    .max(2_000_000, { message: "run.points must be at most 2,000,000" }),
  // Absent: "settled" for the two amplifier kinds, "low" for the others (lib/sim decides).
  initialOutput: z
    .enum(["low", "high", "settled"], { error: 'run.initialOutput must be "low", "high" or "settled"' })
    .optional(),
  // Extensions (optional): chatter hold-off in seconds and the solver choice.
  holdOff: positive("run.holdOff (s)").optional(),
  solver: z.enum(["exact", "odex"], { error: 'run.solver must be "exact" or "odex"' }).optional(),
});

export const inputSchema = z.object({
  components: z
    .array(componentSchema, { error: "input.components must be a list" })
    .min(1, { message: "input.components needs at least one waveform component" })
    .max(64, { message: "input.components may hold at most 64 components" }),
  noise: noiseSchema.optional(),
});

export const STAGE_KINDS = [
  "noninverting-amplifier",
  "inverting-amplifier",
  "comparator",
  "schmitt-noninverting",
  "schmitt-inverting",
  "relaxation-oscillator",
] as const satisfies readonly string[];

// ---------------------------------------------------------------------------------------------
// The design spec (`railwise.design-spec/1`) lives here too, because a scenario keeps the spec
// its stage was designed from (`spec`) and a `source` takes the spec's sensor object;
// lib/schemas/design.ts re-exports it.

export const DESIGN_SPEC_SCHEMA_ID = "railwise.design-spec/1";
export const DESIGN_SCHEMA_ID = "railwise.design/1";

const SERIES = ["E6", "E12", "E24", "E48", "E96", "E192"] as const;

const rangeSchema = (what: string, unit: string, lo: number, hi: number) =>
  z
    .strictObject({
      min: finite(`${what}.min`).refine((v) => v >= lo && v <= hi, {
        message: `${what}.min must lie between ${lo} and ${hi} ${unit}`,
      }),
      max: finite(`${what}.max`).refine((v) => v >= lo && v <= hi, {
        message: `${what}.max must lie between ${lo} and ${hi} ${unit}`,
      }),
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

const celsius = (what: string) =>
  finite(what).refine((v) => v > -273.15 && v < 1000, { message: `${what} must be a temperature in °C above −273.15` });

/** NTC curve: Beta (with R at t0 °C, default 25 °C), Steinhart–Hart coefficients, or three [°C, Ω] points to fit. */
export const ntcModelSchema = z.union(
  [
    z.strictObject({
      beta: positive("sensor.model.beta (K)"),
      r25: positive("sensor.model.r25 (Ω)"),
      t0: celsius("sensor.model.t0 (°C)").optional(),
    }),
    z.strictObject({
      a: finite("sensor.model.a"),
      b: positive("sensor.model.b"),
      c: finite("sensor.model.c").refine((v) => v >= 0, { message: "sensor.model.c must not be negative" }),
    }),
    z.strictObject({
      points: z
        .array(
          z.tuple([celsius("sensor.model.points temperature (°C)"), positive("sensor.model.points resistance (Ω)")]),
          {
            error: "sensor.model.points must be three [°C, Ω] pairs",
          },
        )
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
      rFixed: positive("sensor.rFixed (Ω)"),
      position: z.enum(["top", "bottom"], { error: 'sensor.position must be "top" or "bottom" (where the NTC sits)' }),
      /** Divider supply (V); default supply.positive. */
      supplyVoltage: positive("sensor.supplyVoltage (V)").optional(),
      /** Dissipation constant δ (W/K) for the self-heating check. */
      dissipationConstant: positive("sensor.dissipationConstant (W/K)").optional(),
      /** Accuracy wanted (K); self-heating above a quarter of it is flagged. Default 0.5 K. */
      accuracy: positive("sensor.accuracy (K)").optional(),
    }),
    z.strictObject({
      kind: z.literal("linear"),
      voltsPerUnit: finite("sensor.voltsPerUnit").refine((v) => v !== 0, {
        message: "sensor.voltsPerUnit must not be 0",
      }),
      offset: volts("sensor.offset"),
      unit: z.string().max(20, { message: "sensor.unit must be at most 20 characters" }).optional(),
    }),
    z.strictObject({
      kind: z.literal("divider"),
      rTop: positive("sensor.rTop (Ω)"),
      rBottom: positive("sensor.rBottom (Ω)"),
    }),
  ],
  { error: 'sensor.kind must be "ntc", "linear" or "divider"' },
);

/** The spec as written: one flat target object whatever the kind (what the wire carries). */
const designSpecFields = z.strictObject({
  schema: z.literal(DESIGN_SPEC_SCHEMA_ID, { error: `schema must be "${DESIGN_SPEC_SCHEMA_ID}"` }),
  name: z.string().max(200, { message: "name must be at most 200 characters" }).optional(),
  kind: z.enum(STAGE_KINDS, {
    error: `kind must be one of ${STAGE_KINDS.join(", ")}`,
  }),
  supply: supplySchema,
  opamp: opampSchema,
  target: designTargetSchema,
  series: z.enum(SERIES, { error: `series must be one of ${SERIES.join(", ")}` }),
  /** Resistor tolerance; defaults to the series' usual tolerance. */
  tolerance: fraction("tolerance", 0.2).optional(),
  reference: z
    .union([volts("reference"), z.literal("auto")], { error: 'reference must be a voltage or "auto"' })
    .optional(),
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
  /** RC filter suggestion: the input must not reach the switching point within `bounceTime` of a step of `step` volts at the stage input (default the positive supply). */
  filter: z
    .strictObject({
      bounceTime: positive("filter.bounceTime (s)").refine((v) => v <= 100, {
        message: "filter.bounceTime must be at most 100 s",
      }),
      step: volts("filter.step").optional(),
    })
    .optional(),
  /** Open-drain output: the pull-up (chosen from the series unless given) and the load; thresholds are designed with the loaded high level. */
  output: z
    .strictObject({
      kind: z.literal("open-drain", { error: 'output.kind must be "open-drain" (push-pull is the default)' }),
      pullUp: positive("output.pullUp (Ω)").optional(),
      pullUpTo: z
        .union([z.literal("positive"), volts("output.pullUpTo")], {
          error: 'output.pullUpTo must be "positive" or a voltage',
        })
        .optional(),
      load: z.strictObject({ r: positive("output.load.r (Ω)"), to: volts("output.load.to").optional() }).optional(),
    })
    .optional(),
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
        distribution: z
          .enum(["uniform", "normal"], { error: 'monteCarlo.distribution must be "uniform" or "normal"' })
          .optional(),
        bins: z.number().int().min(1).max(200, { message: "monteCarlo.bins must be at most 200" }).optional(),
      }),
    ])
    .optional(),
});

/** Every rule across fields, each issue naming its field (the per-kind union below only narrows the type). */
const designSpecChecked = designSpecFields.superRefine((s, ctx) => {
  const issue = (path: (string | number)[], message: string) => ctx.addIssue({ code: "custom", path, message });
  const span = s.supply.positive - s.supply.negative;
  if (s.opamp.outputHeadroomHigh + s.opamp.outputHeadroomLow >= span) {
    issue(
      ["opamp", "outputHeadroomHigh"],
      `outputHeadroomHigh + outputHeadroomLow must be smaller than the supply span (${span} V)`,
    );
  }
  if (typeof s.reference === "number" && (s.reference > s.supply.positive || s.reference < s.supply.negative)) {
    issue(
      ["reference"],
      `reference (${s.reference} V) must lie within the supplies (${s.supply.negative} V … ${s.supply.positive} V)`,
    );
  }
  const t = s.target;
  const has = (k: keyof typeof t) => t[k] !== undefined;
  const only = (allowed: (keyof typeof t)[]) => {
    for (const k of Object.keys(t) as (keyof typeof t)[]) {
      if (!allowed.includes(k))
        issue(["target", k], `target.${k} does not apply to ${s.kind} (use ${allowed.join(", ")})`);
    }
  };
  switch (s.kind) {
    case "schmitt-inverting":
    case "schmitt-noninverting":
      only(["upperThreshold", "lowerThreshold"]);
      if (!has("upperThreshold"))
        issue(["target", "upperThreshold"], "target.upperThreshold is required for a Schmitt trigger");
      if (!has("lowerThreshold"))
        issue(["target", "lowerThreshold"], "target.lowerThreshold is required for a Schmitt trigger");
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
          if (has(k) && t[k] !== t.threshold)
            issue(["target", k], `target.${k} must equal target.threshold for a comparator`);
      } else if (!has("upperThreshold") || !has("lowerThreshold")) {
        issue(
          ["target", "threshold"],
          "target.threshold (or equal upperThreshold and lowerThreshold) is required for a comparator",
        );
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
        issue(
          ["target", "gain"],
          `target.gain (${t.gain}) must be above 1 and at most 100000 for a non-inverting amplifier (a gain of 1 is a follower and needs no resistors)`,
        );
      if (s.reference === "auto")
        issue(
          ["reference"],
          'reference "auto" is not offered for the non-inverting amplifier: rGround returns its current into the reference, so give a buffered reference voltage',
        );
      break;
    case "inverting-amplifier":
      only(["gain"]);
      if (!has("gain")) issue(["target", "gain"], "target.gain is required for an amplifier");
      else if (!(Math.abs(t.gain!) > 0 && Math.abs(t.gain!) <= 1e5))
        issue(
          ["target", "gain"],
          `target.gain (${t.gain}) must be non-zero with a magnitude of at most 100000 (−10 and 10 both mean an inverting gain of −10)`,
        );
      break;
    case "relaxation-oscillator":
      only(["frequency", "duty"]);
      if (!has("frequency")) issue(["target", "frequency"], "target.frequency is required for a relaxation oscillator");
      break;
  }
  if (s.inputAt !== undefined && s.kind !== "comparator") issue(["inputAt"], "inputAt applies to the comparator only");
  if (s.filter && !["comparator", "schmitt-inverting", "schmitt-noninverting"].includes(s.kind))
    issue(
      ["filter"],
      "a filter suggestion applies to threshold stages only (comparator, schmitt-inverting, schmitt-noninverting)",
    );
  if (s.output && !["comparator", "schmitt-inverting", "schmitt-noninverting"].includes(s.kind))
    issue(
      ["output"],
      "an open-drain output applies to threshold stages only (comparator, schmitt-inverting, schmitt-noninverting)",
    );
  if (s.sensor && !["comparator", "schmitt-inverting", "schmitt-noninverting"].includes(s.kind))
    issue(
      ["sensor"],
      "a sensor applies to threshold stages only (comparator, schmitt-inverting, schmitt-noninverting)",
    );
});

// A target per kind (lib/schemas/README.md § Design spec JSON). The wire keeps one `target` key;
// these only say which of its fields each kind has, so the design code needs no `!`.
const tf = designTargetSchema.shape;
// Fields of other kinds are typed as absent, so `target.gain` reads as undefined on a Schmitt
// trigger's spec instead of failing to compile; the flat parse has refused them by name already.
const none = z.undefined().optional();
const absent = { upperThreshold: none, lowerThreshold: none, threshold: none, gain: none, frequency: none, duty: none };
const thresholdPair = { upperThreshold: tf.upperThreshold.unwrap(), lowerThreshold: tf.lowerThreshold.unwrap() };
/** Schmitt triggers: both switching points (upper above lower). */
export const thresholdPairTargetSchema = z.strictObject({ ...absent, ...thresholdPair });
/** Comparator: `{ threshold }` (upper and lower may repeat it) or equal `{ upperThreshold, lowerThreshold }`. */
export const comparatorTargetSchema = z.union([
  z.strictObject({
    ...absent,
    threshold: tf.threshold.unwrap(),
    upperThreshold: tf.upperThreshold,
    lowerThreshold: tf.lowerThreshold,
  }),
  thresholdPairTargetSchema,
]);
/** Amplifiers: the gain (an inverting gain may be written −10 or 10). */
export const gainTargetSchema = z.strictObject({ ...absent, gain: tf.gain.unwrap() });
/** Relaxation oscillator: the frequency and an optional duty cycle. */
export const oscillatorTargetSchema = z.strictObject({ ...absent, frequency: tf.frequency.unwrap(), duty: tf.duty });

const specOf = <K extends (typeof STAGE_KINDS)[number], T extends z.ZodType>(kind: K, target: T) =>
  designSpecFields.extend({ kind: z.literal(kind), target });
const byKind = z.discriminatedUnion("kind", [
  specOf("comparator", comparatorTargetSchema),
  specOf("schmitt-inverting", thresholdPairTargetSchema),
  specOf("schmitt-noninverting", thresholdPairTargetSchema),
  specOf("noninverting-amplifier", gainTargetSchema),
  specOf("inverting-amplifier", gainTargetSchema),
  specOf("relaxation-oscillator", oscillatorTargetSchema),
]);

/**
 * `railwise.design-spec/1`. Parsed flat first, so every refusal names its field in words; the
 * result is then a union on `kind` with that kind's target (the values are not changed).
 */
export const designSpecSchema = designSpecChecked.pipe(byKind);

/** The input-referred switching points of a threshold kind's target (a comparator's are equal). */
export function thresholdsOf(target: z.infer<typeof comparatorTargetSchema>): { upper: number; lower: number } {
  if (target.threshold !== undefined) return { upper: target.threshold, lower: target.threshold };
  return { upper: target.upperThreshold, lower: target.lowerThreshold };
}

export const SCENARIO_SCHEMA_ID = "railwise.scenario/1";

// ---------------------------------------------------------------------------------------------
// The circuit as built (lib/schemas/README.md): source, filter, output, tolerances, spec.

export const sourceSchema = z.strictObject({
  /** A label, e.g. "battery", "water temperature". */
  quantity: z
    .string({ error: "source.quantity must be text" })
    .max(60, { message: "source.quantity must be at most 60 characters" })
    .optional(),
  /** Default "V" (divider), "°C" (ntc), sensor.unit (linear). */
  unit: z
    .string({ error: "source.unit must be text" })
    .min(1, { message: "source.unit must not be empty" })
    .max(20, { message: "source.unit must be at most 20 characters" })
    .optional(),
  sensor: sensorSchema,
});

export const filterSchema = z.strictObject({
  r: ohms("filter.r"),
  c: positive("filter.c (F)", 1),
});

export const outputSchema = z.discriminatedUnion(
  "kind",
  [
    z.strictObject({ kind: z.literal("push-pull") }),
    z.strictObject({
      kind: z.literal("open-drain"),
      pullUp: ohms("output.pullUp"),
      /** Default "positive" (the positive supply). */
      pullUpTo: z
        .union([z.literal("positive"), volts("output.pullUpTo")], {
          error: 'output.pullUpTo must be "positive" or a voltage',
        })
        .optional(),
      load: z.strictObject({ r: ohms("output.load.r"), to: volts("output.load.to").optional() }).optional(),
    }),
  ],
  { error: 'output.kind must be "push-pull" or "open-drain"' },
);

export const DEFAULT_TOLERANCES = {
  resistor: 0.01,
  capacitor: 0.05,
  reference: 0,
  ntcR25: 0.01,
  ntcBeta: 0.01,
} as const;

export const tolerancesSchema = z.strictObject({
  resistor: fraction("tolerances.resistor", 0.5).optional(),
  capacitor: fraction("tolerances.capacitor", 0.8).optional(),
  reference: fraction("tolerances.reference", 0.5).optional(),
  ntcR25: fraction("tolerances.ntcR25", 0.5).optional(),
  ntcBeta: fraction("tolerances.ntcBeta", 0.5).optional(),
});

/** Voltage of a reference-divider end: "positive" = supply.positive, "negative" = supply.negative, "ground" = 0 V. */
export function dividerEndVolts(
  end: "positive" | "negative" | "ground" | number | undefined,
  supply: { positive: number; negative: number },
  fallback: "positive" | "ground",
): number {
  const e = end ?? fallback;
  return e === "positive" ? supply.positive : e === "negative" ? supply.negative : e === "ground" ? 0 : e;
}

/** Open-circuit voltage and Thevenin resistance of a reference divider (rTop from `top` to the node, rBottom from the node to `bottom`). */
export function referenceDividerThevenin(
  d: z.infer<typeof referenceDividerSchema>,
  supply: { positive: number; negative: number },
): { voltage: number; resistance: number; top: number; bottom: number } {
  const top = dividerEndVolts(d.top, supply, "positive");
  const bottom = dividerEndVolts(d.bottom, supply, "ground");
  return {
    voltage: bottom + ((top - bottom) * d.rBottom) / (d.rTop + d.rBottom),
    resistance: (d.rTop * d.rBottom) / (d.rTop + d.rBottom),
    top,
    bottom,
  };
}

/** Stage kinds whose input pin draws current from the source (lib/schemas/README.md § The circuit as built, source). */
export const CURRENT_DRAWING_KINDS: readonly StageKind[] = ["schmitt-noninverting", "inverting-amplifier"];

const scenarioObject = z.object({
  schema: z.literal(SCENARIO_SCHEMA_ID, { error: `schema must be "${SCENARIO_SCHEMA_ID}"` }),
  name: z.string().max(200, { message: "name must be at most 200 characters" }).optional(),
  supply: supplySchema,
  opamp: opampSchema,
  stage: stageSchema,
  input: inputSchema,
  run: runSettingsSchema,
  source: sourceSchema.optional(),
  filter: filterSchema.optional(),
  output: outputSchema.optional(),
  tolerances: tolerancesSchema.optional(),
  spec: designSpecSchema.optional(),
});

type ParsedScenarioObject = z.output<typeof scenarioObject>;
type WithReference<S> = S extends { kind: "schmitt-inverting" | "relaxation-oscillator" }
  ? Omit<S, "reference" | "rReference"> & { reference: number; rReference: number }
  : S extends unknown
    ? Omit<S, "reference"> & { reference: number }
    : never;
type ResolvedScenario = Omit<ParsedScenarioObject, "stage"> & { stage: WithReference<ParsedScenarioObject["stage"]> };

export const scenarioSchema = scenarioObject
  .superRefine((s, ctx) => {
    const issue = (path: (string | number)[], message: string) => ctx.addIssue({ code: "custom", path, message });
    const span = s.supply.positive - s.supply.negative;
    if (s.opamp.outputHeadroomHigh + s.opamp.outputHeadroomLow >= span) {
      issue(
        ["opamp", "outputHeadroomHigh"],
        `outputHeadroomHigh + outputHeadroomLow (${s.opamp.outputHeadroomHigh + s.opamp.outputHeadroomLow} V) must be smaller than the supply span (${span} V)`,
      );
    }
    const st = s.stage;
    const within = (v: number) => v <= s.supply.positive && v >= s.supply.negative;
    const supplies = `(${s.supply.negative} V … ${s.supply.positive} V)`;
    if (st.referenceDivider) {
      const th = referenceDividerThevenin(st.referenceDivider, s.supply);
      if (!within(th.top))
        issue(
          ["stage", "referenceDivider", "top"],
          `stage.referenceDivider.top (${th.top} V) must lie within the supplies ${supplies}`,
        );
      if (!within(th.bottom))
        issue(
          ["stage", "referenceDivider", "bottom"],
          `stage.referenceDivider.bottom (${th.bottom} V) must lie within the supplies ${supplies}`,
        );
      if (!(th.top > th.bottom))
        issue(
          ["stage", "referenceDivider", "top"],
          `stage.referenceDivider.top (${th.top} V) must be above its bottom end (${th.bottom} V)`,
        );
      // A stored scenario carries the filled-in open-circuit voltage; anything else is a second reference.
      if (st.reference !== undefined && Math.abs(st.reference - th.voltage) > 1e-9 * Math.max(1, Math.abs(th.voltage)))
        issue(
          ["stage", "referenceDivider"],
          "give exactly one of stage.reference (a voltage) and stage.referenceDivider",
        );
      if (
        (st.kind === "schmitt-inverting" || st.kind === "relaxation-oscillator") &&
        st.rReference !== undefined &&
        Math.abs(st.rReference - th.resistance) > 1e-9 * th.resistance
      )
        issue(
          ["stage", "rReference"],
          `stage.rReference must be absent with stage.referenceDivider: for ${st.kind} the divider's two resistors meet at v+ with rFeedback and replace it`,
        );
    } else {
      if (st.reference !== undefined && !within(st.reference))
        issue(["stage", "reference"], `stage.reference (${st.reference} V) must lie within the supplies ${supplies}`);
      if ((st.kind === "schmitt-inverting" || st.kind === "relaxation-oscillator") && st.rReference === undefined)
        issue(
          ["stage", "rReference"],
          "rReference must be a positive resistance in Ω (or give stage.referenceDivider instead)",
        );
    }
    if (s.filter && st.kind === "relaxation-oscillator")
      issue(["filter"], "filter does not apply to the relaxation oscillator (its input is not connected)");
    if (s.source?.sensor.kind === "ntc" && CURRENT_DRAWING_KINDS.includes(st.kind) && !s.filter)
      issue(
        ["source", "sensor"],
        `an NTC source cannot feed the ${st.kind} input directly: that input draws current and the NTC's resistance changes with temperature; put it on a high-impedance input (comparator, schmitt-inverting) or add a filter`,
      );
    if (
      s.source?.sensor.kind === "ntc" &&
      s.source.sensor.supplyVoltage !== undefined &&
      !within(s.source.sensor.supplyVoltage)
    )
      issue(
        ["source", "sensor", "supplyVoltage"],
        `source.sensor.supplyVoltage (${s.source.sensor.supplyVoltage} V) must lie within the supplies ${supplies}`,
      );
    if (s.output?.kind === "open-drain") {
      const to =
        s.output.pullUpTo === undefined || s.output.pullUpTo === "positive" ? s.supply.positive : s.output.pullUpTo;
      const vol = s.supply.negative + s.opamp.outputHeadroomLow;
      if (!(to > vol))
        issue(["output", "pullUpTo"], `output.pullUpTo (${to} V) must be above the output's low level (${vol} V)`);
    }
  })
  .transform((s): ResolvedScenario => {
    const st = s.stage;
    if (!st.referenceDivider)
      return { ...s, stage: { ...st, reference: st.reference ?? 0 } as WithReference<typeof st> };
    // Fill the divider's Thevenin form (open-circuit voltage, and the resistance where the divider
    // replaces rReference): electrically exact for the linear network, so every reader of the plain
    // fields sees the same stage. The parts to buy stay the divider's two resistors (lib/design/bom).
    const th = referenceDividerThevenin(st.referenceDivider, s.supply);
    const replaces = st.kind === "schmitt-inverting" || st.kind === "relaxation-oscillator";
    return {
      ...s,
      stage: { ...st, reference: th.voltage, ...(replaces ? { rReference: th.resistance } : {}) } as WithReference<
        typeof st
      >,
    };
  });

export type Scenario = z.infer<typeof scenarioSchema>;
export type ScenarioInput = z.input<typeof scenarioSchema>;
export type Stage = Scenario["stage"];
export type StageKind = (typeof STAGE_KINDS)[number];
export type OpAmp = Scenario["opamp"];
export type Supply = Scenario["supply"];
export type InputComponent = Scenario["input"]["components"][number];
export type Noise = NonNullable<Scenario["input"]["noise"]>;
export type RunSettings = Scenario["run"];

/** One line per issue: `stage.rFeedback: rFeedback must be a positive resistance in Ω`. */
export function describeIssues(error: z.ZodError): string[] {
  return error.issues.map((i) => `${i.path.length ? i.path.join(".") : "(root)"}: ${i.message}`);
}

/** Parse or throw a readable error naming each field. */
export function parseScenario(value: unknown): Scenario {
  const r = scenarioSchema.safeParse(value);
  if (!r.success) throw new ScenarioError(describeIssues(r.error));
  return r.data;
}

export class ScenarioError extends Error {
  constructor(readonly issues: string[]) {
    super(`Invalid scenario:\n  ${issues.join("\n  ")}`);
    this.name = "ScenarioError";
  }
}
