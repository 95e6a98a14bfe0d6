// The design spec as a union on `kind` (lib/schemas/README.md § Design spec JSON): the wire keeps
// one flat `target`, parsing neither adds nor drops a field, refusals still name their field, and
// the parsed type carries each kind's own target. Common practice, no source.
import { describe, expect, expectTypeOf, it } from "vitest";
import { GENERAL_PURPOSE_BIPOLAR } from "@/lib/demo/parts";
import { type DesignSpec, designSpecSchema, thresholdsOf } from "@/lib/schemas/design";

const base = {
  schema: "railwise.design-spec/1",
  supply: { positive: 12, negative: -12 },
  opamp: GENERAL_PURPOSE_BIPOLAR,
  series: "E24",
} as const;

const targets: [DesignSpec["kind"], Record<string, number>][] = [
  ["comparator", { threshold: 1.2 }],
  ["comparator", { upperThreshold: -0.6, lowerThreshold: -0.6 }],
  ["comparator", { threshold: 2, upperThreshold: 2, lowerThreshold: 2 }],
  ["schmitt-inverting", { upperThreshold: 1, lowerThreshold: -1 }],
  ["schmitt-noninverting", { upperThreshold: 3, lowerThreshold: 2 }],
  ["noninverting-amplifier", { gain: 11 }],
  ["inverting-amplifier", { gain: -4.7 }],
  ["relaxation-oscillator", { frequency: 1.5 }],
  ["relaxation-oscillator", { frequency: 200, duty: 0.3 }],
];

describe("design spec union on kind", () => {
  it.each(targets)("%s %j parses to exactly what was sent", (kind, target) => {
    const spec = { ...base, kind, target };
    // toStrictEqual: no key added, not even one holding undefined (key order is the schema's, as before).
    expect(designSpecSchema.parse(spec)).toStrictEqual(spec);
  });

  it("still refuses a target field of another kind, and a missing one, by name", () => {
    const other = designSpecSchema.safeParse({
      ...base,
      kind: "schmitt-inverting",
      target: { upperThreshold: 1, lowerThreshold: -1, gain: 3 },
    });
    expect(other.success).toBe(false);
    expect(other.error?.issues.map((i) => [i.path.join("."), i.message])).toEqual([
      ["target.gain", "target.gain does not apply to schmitt-inverting (use upperThreshold, lowerThreshold)"],
    ]);
    const missing = designSpecSchema.safeParse({ ...base, kind: "relaxation-oscillator", target: { duty: 0.4 } });
    expect(missing.error?.issues.map((i) => i.path.join("."))).toEqual(["target.frequency"]);
    expect(missing.error?.issues[0].message).toBe("target.frequency is required for a relaxation oscillator");
  });

  it("reads a comparator's switching point from either spelling", () => {
    expect(thresholdsOf({ threshold: 1.2 })).toEqual({ upper: 1.2, lower: 1.2 });
    expect(thresholdsOf({ upperThreshold: -0.6, lowerThreshold: -0.6 })).toEqual({ upper: -0.6, lower: -0.6 });
  });

  it("narrows the target with the kind", () => {
    const spec = designSpecSchema.parse({
      ...base,
      kind: "schmitt-noninverting",
      target: { upperThreshold: 3, lowerThreshold: 2 },
    });
    if (spec.kind === "schmitt-noninverting") {
      expectTypeOf(spec.target.upperThreshold).toEqualTypeOf<number>();
      expectTypeOf(spec.target.gain).toEqualTypeOf<undefined>();
      expect(spec.target.upperThreshold - spec.target.lowerThreshold).toBe(1);
    }
    if (spec.kind === "relaxation-oscillator") expectTypeOf(spec.target.frequency).toEqualTypeOf<number>();
    if (spec.kind === "inverting-amplifier") expectTypeOf(spec.target.gain).toEqualTypeOf<number>();
    expect(spec.kind).toBe("schmitt-noninverting");
  });
});
