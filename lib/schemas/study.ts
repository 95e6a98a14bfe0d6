// zod shapes of the studies (`railwise.study/1`): configurations sent to the workers and the
// saved study stored with a run. All values in SI units (V, Hz, s); tolerances as fractions.
import { z } from "zod";
import { finite } from "./units";

const seed = z
  .number({ error: "seed must be a whole number" })
  .int({ message: "seed must be a whole number" })
  .min(0, { message: "seed must not be negative" })
  .max(4294967295, { message: "seed must fit in 32 bits" });
const count = (what: string, min: number, max: number) =>
  z
    .number({ error: `${what} must be a whole number` })
    .int({ message: `${what} must be a whole number` })
    .min(min, { message: `${what} must be at least ${min}` })
    .max(max, { message: `${what} must be at most ${max}` });
const window = (what: string) =>
  z
    .tuple([finite(`${what} minimum`), finite(`${what} maximum`)], { error: `${what} must be [min, max]` })
    .refine(([a, b]) => b > a, { message: `${what} maximum must be above its minimum` });

export const MAX_STUDY_TASKS = 20_000;

export const noiseMarginConfigSchema = z
  .object({
    kind: z.literal("noise-margin"),
    seed,
    /** Noise rms levels swept: `levels` values from rmsFrom to rmsTo, evenly spaced. */
    rmsFrom: finite("rmsFrom (V)").refine((v) => v >= 0, { message: "rmsFrom must not be negative" }),
    rmsTo: finite("rmsTo (V)").refine((v) => v > 0 && v <= 1000, {
      message: "rmsTo must be above 0 and at most 1000 V",
    }),
    levels: count("levels", 2, 200),
    seedsPerLevel: count("seedsPerLevel", 1, 10_000),
    /** Noise bandwidth in Hz (the noise model of the scenario contract). */
    bandwidth: finite("bandwidth (Hz)").refine((v) => v > 0 && v <= 1e11, {
      message: "bandwidth must be above 0 and at most 1e11 Hz",
    }),
    /** Chatter probability limit for the "largest safe noise" answer, e.g. 0.01. */
    limit: finite("limit").refine((v) => v > 0 && v < 1, { message: "limit must be between 0 and 1" }),
    holdOff: finite("holdOff (s)")
      .refine((v) => v > 0, { message: "holdOff must be above 0" })
      .optional(),
    /** Noise estimated from a capture, shown against the sweep. */
    measured: z
      .object({
        rms: finite("measured.rms (V)").refine((v) => v >= 0, { message: "measured.rms must not be negative" }),
        bandwidth: finite("measured.bandwidth (Hz)").refine((v) => v > 0, {
          message: "measured.bandwidth must be above 0",
        }),
        label: z.string().max(200).optional(),
      })
      .optional(),
  })
  .refine((c) => c.rmsTo > c.rmsFrom, { message: "rmsTo must be above rmsFrom", path: ["rmsTo"] })
  .refine((c) => c.levels * c.seedsPerLevel <= MAX_STUDY_TASKS, {
    message: `levels × seedsPerLevel must be at most ${MAX_STUDY_TASKS}`,
    path: ["seedsPerLevel"],
  });

export const MEASURES = ["upperThreshold", "lowerThreshold", "gain", "period"] as const;
export const measureSchema = z.enum(MEASURES, { error: `measure must be one of ${MEASURES.join(", ")}` });

export const toleranceSpreadConfigSchema = z.object({
  kind: z.literal("tolerance-spread"),
  seed,
  draws: count("draws", 1, MAX_STUDY_TASKS),
  /** Relative resistor tolerance, e.g. 0.01 for 1 %. */
  resistorTolerance: finite("resistorTolerance").refine((v) => v >= 0 && v <= 0.5, {
    message: "resistorTolerance must be between 0 and 0.5",
  }),
  /** Capacitor tolerance (fraction) for cTiming; defaults to resistorTolerance. */
  capacitorTolerance: finite("capacitorTolerance")
    .refine((v) => v >= 0 && v <= 0.5, { message: "capacitorTolerance must be between 0 and 0.5" })
    .optional(),
  /** Input offset magnitude (V): the offset is drawn in ±this (a part profile's offset has no known sign). */
  offsetTolerance: finite("offsetTolerance (V)").refine((v) => v >= 0 && v <= 1, {
    message: "offsetTolerance must be between 0 and 1 V",
  }),
  /** Output headroom spread as a fraction of each nominal headroom (± this share), e.g. 0.2. */
  headroomSpread: finite("headroomSpread").refine((v) => v >= 0 && v <= 1, {
    message: "headroomSpread must be between 0 and 1",
  }),
  distribution: z.enum(["uniform", "normal"], { error: 'distribution must be "uniform" or "normal"' }),
  /** "scenario": the scenario's own input without its noise; "triangle": one slow sweep low→high→low. */
  probe: z.discriminatedUnion(
    "kind",
    [
      z.object({ kind: z.literal("scenario") }),
      z
        .object({ kind: z.literal("triangle"), low: finite("probe.low (V)"), high: finite("probe.high (V)") })
        .refine((p) => p.high > p.low, { message: "probe.high must be above probe.low", path: ["high"] }),
    ],
    { error: 'probe.kind must be "scenario" or "triangle"' },
  ),
  measures: z.array(measureSchema).min(1, { message: "measures needs at least one figure" }).max(4),
  /** Spec window per figure; a draw is inside when every windowed figure lies in its window. */
  window: z
    .object({
      upperThreshold: window("window.upperThreshold").optional(),
      lowerThreshold: window("window.lowerThreshold").optional(),
      gain: window("window.gain").optional(),
      period: window("window.period").optional(),
    })
    .default({}),
  bins: count("bins", 4, 200).default(30),
  holdOff: finite("holdOff (s)")
    .refine((v) => v > 0, { message: "holdOff must be above 0" })
    .optional(),
});

export const studyConfigSchema = z.discriminatedUnion("kind", [noiseMarginConfigSchema, toleranceSpreadConfigSchema], {
  error: 'study kind must be "noise-margin" or "tolerance-spread"',
});

export type NoiseMarginConfig = z.infer<typeof noiseMarginConfigSchema>;
export type ToleranceSpreadConfig = z.infer<typeof toleranceSpreadConfigSchema>;
export type ToleranceSpreadConfigInput = z.input<typeof toleranceSpreadConfigSchema>;
export type StudyConfig = z.infer<typeof studyConfigSchema>;
export type Measure = (typeof MEASURES)[number];

const nullableNumber = z.number().refine(Number.isFinite, { message: "must be finite" }).nullable();

/** Raw output of one tolerance draw: the figures measured on the perturbed stage. */
export const drawOutputSchema = z.object({
  upperThreshold: nullableNumber,
  lowerThreshold: nullableNumber,
  gain: nullableNumber,
  period: nullableNumber,
  /** The solver gave up on this draw (counted and shown, never silently dropped). */
  failed: z.literal(true).optional(),
});
export type DrawOutput = z.infer<typeof drawOutputSchema>;

/** Raw output of one noise task (task 0 is the noise-free reference). */
export const noiseTaskOutputSchema = z.object({
  transitions: count("transitions", 0, 100_000_000),
  hysteresis: nullableNumber,
  upperThreshold: nullableNumber,
  lowerThreshold: nullableNumber,
  /** The solver gave up on this run: left out of its level's count, and reported. */
  failed: z.literal(true).optional(),
});
export type NoiseTaskOutput = z.infer<typeof noiseTaskOutputSchema>;

/**
 * What a client sends to save a study with a run: the configurations and the raw per-task
 * outputs in task order. The server recomputes every summary from these and re-simulates a
 * few tasks to check them; no summary number is taken from the client.
 */
export const studyUploadSchema = z
  .object({
    schema: z.literal("railwise.study/1", { error: 'schema must be "railwise.study/1"' }),
    noiseMargin: z
      .object({
        config: noiseMarginConfigSchema,
        tasks: z.array(noiseTaskOutputSchema).max(MAX_STUDY_TASKS + 1),
        wallMs: z.number().nonnegative().optional(),
        workers: count("workers", 1, 64).optional(),
      })
      .optional(),
    toleranceSpread: z
      .object({
        config: toleranceSpreadConfigSchema,
        tasks: z.array(drawOutputSchema).max(MAX_STUDY_TASKS + 1),
        wallMs: z.number().nonnegative().optional(),
        workers: count("workers", 1, 64).optional(),
      })
      .optional(),
  })
  .refine((s) => s.noiseMargin || s.toleranceSpread, { message: "a study needs noiseMargin or toleranceSpread" });
export type StudyUpload = z.infer<typeof studyUploadSchema>;
export type StudyUploadInput = z.input<typeof studyUploadSchema>;

// ---- A study as stored with its run (`runs.study`, `railwise.study/1`) ----
// The one declaration of these shapes: lib/studies computes them, the run routes answer them.

const tally = z.number().int().nonnegative();
const maybeNumber = z.number().nullable();

export const noiseLevelSummarySchema = z.strictObject({
  rms: z.number(),
  /** Seeds that ran to the end (failed runs are left out). */
  seeds: tally,
  failed: tally,
  chattered: tally,
  probability: z.number(),
  low: z.number(),
  high: z.number(),
});

export const noiseMarginSummarySchema = z.strictObject({
  referenceTransitions: tally,
  /** Deadband measured on the noise-free run (upper − lower threshold); 0 when it has none. */
  deadband: z.number(),
  /** deadband / 6.6: the largest rms the rule of thumb accepts. */
  ruleOfThumbRms: z.number(),
  levels: z.array(noiseLevelSummarySchema),
  /** Largest swept rms whose estimate — and every lower level's — stays at or under the limit. */
  safeRms: maybeNumber,
  /** The same, but on the upper end of the Wilson interval (null when the seeds are too few). */
  safeRmsConfident: maybeNumber,
  limit: z.number(),
  measured: noiseMarginConfigSchema.shape.measured.unwrap().nullable(),
  /** Chatter estimate at the swept level nearest above the measured rms, if any. */
  measuredVerdict: z.enum(["inside", "outside", "beyond-sweep"]).nullable(),
});

export const spreadSummarySchema = z.strictObject({
  count: tally,
  mean: maybeNumber,
  std: maybeNumber,
  min: maybeNumber,
  max: maybeNumber,
});
const pair = z.tuple([z.number(), z.number()]);

export const toleranceSpreadSummarySchema = z.strictObject({
  draws: tally,
  /** Draws the solver gave up on (their figures count as missing). */
  failed: tally,
  measures: z.array(
    z.strictObject({
      measure: z.enum(MEASURES),
      nominal: maybeNumber,
      summary: spreadSummarySchema,
      /** Draws where the figure could not be measured (e.g. the stage never switched). */
      missing: tally,
      /** bins + 1 edges, ascending; `counts` per bin. */
      histogram: z.strictObject({ edges: z.array(z.number()), counts: z.array(tally) }),
      /** Worst-case corners [min, max] from lib/design, when the caller supplies them. */
      worstCase: pair.nullable(),
      window: pair.nullable(),
      inside: tally.nullable(),
    }),
  ),
  /** Draws with every windowed figure measured and inside its window (null: no window set). */
  inside: tally.nullable(),
  insideShare: maybeNumber,
  insideLow: maybeNumber,
  insideHigh: maybeNumber,
});

const uploaded = studyUploadSchema.shape;

/** A study as stored with its run: the uploaded parts plus the summaries the server computed. */
export const savedStudySchema = z.strictObject({
  schema: z.literal("railwise.study/1"),
  noiseMargin: z.strictObject({ ...uploaded.noiseMargin.unwrap().shape, summary: noiseMarginSummarySchema }).optional(),
  toleranceSpread: z
    .strictObject({ ...uploaded.toleranceSpread.unwrap().shape, summary: toleranceSpreadSummarySchema })
    .optional(),
});

export type NoiseLevelSummary = z.infer<typeof noiseLevelSummarySchema>;
export type NoiseMarginSummary = z.infer<typeof noiseMarginSummarySchema>;
export type SpreadSummary = z.infer<typeof spreadSummarySchema>;
export type ToleranceSpreadSummary = z.infer<typeof toleranceSpreadSummarySchema>;
export type MeasureSpread = ToleranceSpreadSummary["measures"][number];
export type SavedStudy = z.infer<typeof savedStudySchema>;
