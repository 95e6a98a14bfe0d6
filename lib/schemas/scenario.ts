// The `railwise.scenario/1` contract (DESIGN.md). All values in SI base units.
// Shared by the API, the simulator, the CLIs and the workbench form.
import { z } from "zod";

const MAX_ABS_VOLTS = 1000;

const finite = (what: string) =>
  z.number({ error: `${what} must be a number` }).refine(Number.isFinite, { message: `${what} must be finite` });

const volts = (what: string) =>
  finite(what).refine((v) => Math.abs(v) <= MAX_ABS_VOLTS, { message: `${what} must be within ±${MAX_ABS_VOLTS} V` });

const ohms = (what: string) =>
  finite(what)
    .refine((v) => v > 0, { message: `${what} must be a positive resistance in Ω` })
    .refine((v) => v <= 1e12, { message: `${what} must be at most 1 TΩ` });

const positive = (what: string, max = Number.MAX_VALUE) =>
  finite(what)
    .refine((v) => v > 0, { message: `${what} must be greater than 0` })
    .refine((v) => v <= max, { message: `${what} must be at most ${max}` });

const nonNegative = (what: string, max = Number.MAX_VALUE) =>
  finite(what)
    .refine((v) => v >= 0, { message: `${what} must not be negative` })
    .refine((v) => v <= max, { message: `${what} must be at most ${max}` });

export const supplySchema = z
  .object({ positive: volts("supply.positive"), negative: volts("supply.negative") })
  .refine((s) => s.positive > s.negative, {
    message: "supply.positive must be above supply.negative",
    path: ["positive"],
  });

export const opampSchema = z.object({
  openLoopGain: positive("openLoopGain", 1e10).refine((v) => v >= 1, { message: "openLoopGain must be at least 1 V/V" }),
  gainBandwidth: positive("gainBandwidth (Hz)", 1e11),
  slewRate: positive("slewRate (V/s)", 1e12),
  slewRateFall: positive("slewRateFall (V/s)", 1e12).optional(),
  outputHeadroomHigh: nonNegative("outputHeadroomHigh (V)", MAX_ABS_VOLTS),
  outputHeadroomLow: nonNegative("outputHeadroomLow (V)", MAX_ABS_VOLTS),
  inputOffset: finite("inputOffset (V)").refine((v) => Math.abs(v) <= 1, { message: "inputOffset must be within ±1 V" }),
  propagationDelay: nonNegative("propagationDelay (s)", 1).optional(),
});

const reference = volts("reference").default(0);

export const stageSchema = z.discriminatedUnion("kind", [
  z.object({
    kind: z.literal("noninverting-amplifier"),
    rGround: ohms("rGround"),
    rFeedback: ohms("rFeedback"),
    reference,
  }),
  z.object({
    kind: z.literal("inverting-amplifier"),
    rInput: ohms("rInput"),
    rFeedback: ohms("rFeedback"),
    reference,
  }),
  z.object({
    kind: z.literal("comparator"),
    reference,
    inputAt: z.enum(["noninverting", "inverting"], { error: 'inputAt must be "noninverting" or "inverting"' }).default("noninverting"),
  }),
  z.object({
    kind: z.literal("schmitt-noninverting"),
    rInput: ohms("rInput"),
    rFeedback: ohms("rFeedback"),
    reference,
  }),
  z.object({
    kind: z.literal("schmitt-inverting"),
    rReference: ohms("rReference"),
    rFeedback: ohms("rFeedback"),
    reference,
  }),
  z.object({
    kind: z.literal("relaxation-oscillator"),
    rReference: ohms("rReference"),
    rFeedback: ohms("rFeedback"),
    rTiming: ohms("rTiming"),
    cTiming: positive("cTiming (F)", 1),
    reference,
  }),
], { error: "stage.kind must be one of noninverting-amplifier, inverting-amplifier, comparator, schmitt-noninverting, schmitt-inverting, relaxation-oscillator" });

const timeValuePoints = (what: string, strict: boolean) =>
  z
    .array(z.tuple([finite(`${what} time`), volts(`${what} value`)]), { error: `${what} must be a list of [t, v] pairs` })
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

export const componentSchema = z.discriminatedUnion("kind", [
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
    .refine((p) => p.rise + p.fall <= p.period, { message: "pulse.rise + pulse.fall must fit in pulse.period", path: ["rise"] }),
  z.object({ kind: z.literal("pwl"), points: timeValuePoints("pwl.points", false) }),
  z.object({ kind: z.literal("capture"), samples: timeValuePoints("capture.samples", true) }),
], { error: "input component kind must be one of dc, sine, triangle, ramp, pulse, pwl, capture" });

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
  initialOutput: z.enum(["low", "high", "settled"], { error: 'run.initialOutput must be "low", "high" or "settled"' }).optional(),
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

export const SCENARIO_SCHEMA_ID = "railwise.scenario/1";

export const scenarioSchema = z
  .object({
    schema: z.literal(SCENARIO_SCHEMA_ID, { error: `schema must be "${SCENARIO_SCHEMA_ID}"` }),
    name: z.string().max(200, { message: "name must be at most 200 characters" }).optional(),
    supply: supplySchema,
    opamp: opampSchema,
    stage: stageSchema,
    input: inputSchema,
    run: runSettingsSchema,
  })
  .superRefine((s, ctx) => {
    const span = s.supply.positive - s.supply.negative;
    if (s.opamp.outputHeadroomHigh + s.opamp.outputHeadroomLow >= span) {
      ctx.addIssue({
        code: "custom",
        path: ["opamp", "outputHeadroomHigh"],
        message: `outputHeadroomHigh + outputHeadroomLow (${s.opamp.outputHeadroomHigh + s.opamp.outputHeadroomLow} V) must be smaller than the supply span (${span} V)`,
      });
    }
    if (s.stage.reference > s.supply.positive || s.stage.reference < s.supply.negative) {
      ctx.addIssue({
        code: "custom",
        path: ["stage", "reference"],
        message: `stage.reference (${s.stage.reference} V) must lie within the supplies (${s.supply.negative} V … ${s.supply.positive} V)`,
      });
    }
  });

export type Scenario = z.infer<typeof scenarioSchema>;
export type ScenarioInput = z.input<typeof scenarioSchema>;
export type Stage = Scenario["stage"];
export type StageKind = Stage["kind"];
export type OpAmp = Scenario["opamp"];
export type Supply = Scenario["supply"];
export type InputComponent = Scenario["input"]["components"][number];
export type Noise = NonNullable<Scenario["input"]["noise"]>;
export type RunSettings = Scenario["run"];

export const STAGE_KINDS: StageKind[] = [
  "noninverting-amplifier",
  "inverting-amplifier",
  "comparator",
  "schmitt-noninverting",
  "schmitt-inverting",
  "relaxation-oscillator",
];

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
