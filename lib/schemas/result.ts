// `railwise.result/1` (lib/schemas/README.md § Result JSON): the one place the result's shape is
// declared. lib/sim takes its SimEvent / SimMetrics / SolverStats / ResultJson types from here
// with z.infer (type-only imports, so the core and the `railwise` bin never build these schemas);
// lib/schemas/responses.ts uses the schemas for the run routes' answers.
import { z } from "zod";
import { finite, nonNegative } from "./units";

const count = z.number().int().nonnegative();
const maybe = z.number().nullable();

export const simEventSchema = z.strictObject({
  time: finite("time"),
  edge: z.enum(["rising", "falling"]),
  /** Input (signal incl. noise) at the moment the output crossed mid-level. */
  input: finite("input"),
  /** The source value at the edge, when the scenario has a source (lib/sim/circuit). */
  source: finite("source").optional(),
});

/** Readings of an amplifier stage (lib/schemas/README.md § The circuit as built). */
export const amplifierMetricsSchema = z.strictObject({
  /** Measured vo/vin slope while the output is in its linear region. */
  gain: maybe,
  /** Input where the output first reaches Voh / Vol; null if it never does. */
  clipInputHigh: maybe,
  clipInputLow: maybe,
});

/** Switching metrics are null for the amplifier kinds (they do not switch). */
export const metricsSchema = z.strictObject({
  transitions: count.nullable(),
  upperThreshold: maybe,
  lowerThreshold: maybe,
  hysteresis: maybe,
  chatter: count.nullable(),
  clippedFraction: z.number().min(0).max(1),
  maxSlewRate: nonNegative("maxSlewRate"),
  period: maybe,
  dutyCycle: maybe,
  /** Amplifier kinds only. */
  amplifier: amplifierMetricsSchema.optional(),
  /** Thresholds in source units, when the scenario has a source (lib/sim/circuit). */
  source: z
    .strictObject({ unit: z.string(), upperThreshold: maybe, lowerThreshold: maybe, hysteresis: maybe })
    .optional(),
  // Extras beyond the contract.
  propagationDelay: maybe.optional(),
  riseTime: maybe.optional(),
  fallTime: maybe.optional(),
  holdOff: z.number().positive().optional(),
});

export const solverStatsSchema = z.strictObject({
  name: z.string(),
  steps: count,
  evaluations: count,
  wallMs: z.number().nonnegative(),
});

const series = z.array(z.number());

export const resultJsonSchema = z.strictObject({
  schema: z.literal("railwise.result/1"),
  rails: z.strictObject({ high: finite("rails.high"), low: finite("rails.low") }),
  samples: z.strictObject({
    t: series,
    input: series,
    output: series,
    /** The timing-capacitor voltage (v−) of a relaxation oscillator. */
    capacitor: series.optional(),
    /** The filter node (RC low-pass before the stage input), when the scenario has a filter. */
    filtered: series.optional(),
    /** The input in source units, when the scenario has a source. */
    source: series.optional(),
  }),
  events: z.array(simEventSchema),
  metrics: metricsSchema,
  solver: solverStatsSchema,
});

/** A stored result (runs.result): samples thinned to at most 4,000 points say so in `decimation`. */
export const storedResultSchema = resultJsonSchema.extend({
  decimation: z.strictObject({ from: count, kept: count, method: z.literal("min-max") }).optional(),
});

export type SimEvent = z.infer<typeof simEventSchema>;
export type AmplifierMetrics = z.infer<typeof amplifierMetricsSchema>;
export type SimMetrics = z.infer<typeof metricsSchema>;
export type SolverStats = z.infer<typeof solverStatsSchema>;
export type ResultJson = z.infer<typeof resultJsonSchema>;
export type StoredResultJson = z.infer<typeof storedResultSchema>;
