// The `railwise.design-spec/1` contract (lib/schemas/README.md § Design spec JSON) with Railwise's extensions: comparator
// `{ threshold }`, oscillator `{ frequency, duty? }`, resistor `range`, `maxError`, spread settings.
// The schemas live in ./scenario (a scenario keeps its spec and takes the spec's sensor object);
// this module is the design side's name for them.
import type { z } from "zod";
import type { designSpecSchema } from "./scenario";

export {
  DESIGN_SPEC_SCHEMA_ID,
  DESIGN_SCHEMA_ID,
  designTargetSchema,
  comparatorTargetSchema,
  thresholdPairTargetSchema,
  gainTargetSchema,
  oscillatorTargetSchema,
  thresholdsOf,
  ntcModelSchema,
  sensorSchema,
  designSpecSchema,
} from "./scenario";

export type DesignSpec = z.infer<typeof designSpecSchema>;
export type DesignSpecInput = z.input<typeof designSpecSchema>;
/** The target of any kind (a union: each kind has its own fields). */
export type DesignTarget = DesignSpec["target"];
/** The spec of one stage kind, with that kind's target. */
export type DesignSpecOf<K extends DesignSpec["kind"]> = Extract<DesignSpec, { kind: K }>;
/** The kinds that switch at thresholds (and may take a sensor). */
export type ThresholdKind = "comparator" | "schmitt-inverting" | "schmitt-noninverting";
export type DesignSensor = NonNullable<DesignSpec["sensor"]>;
