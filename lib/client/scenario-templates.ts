// Blank starting points for a new scenario of each stage kind: valid railwise.scenario/1
// documents with round, ordinary values (checked against the schema in
// tests/unit/scenario-templates.test.ts). Pure data; no React.
import { SCENARIO_SCHEMA_ID, type ScenarioInput, type StageKind } from "@/lib/schemas/scenario";

// A generic rail-to-rail CMOS part: 1 MHz GBW, 1 V/µs, 50 mV headroom (common practice, no source).
const GENERIC_OPAMP = {
  openLoopGain: 2e5,
  gainBandwidth: 1e6,
  slewRate: 1e6,
  outputHeadroomHigh: 0.05,
  outputHeadroomLow: 0.05,
  inputOffset: 1e-3,
};

const SINGLE_5V = { positive: 5, negative: 0 };
const DUAL_5V = { positive: 5, negative: -5 };

// A slow triangle across the middle of a 5 V supply, two periods: both switching points show.
const sweepAcrossMidSupply = () => ({
  input: { components: [{ kind: "triangle" as const, amplitude: 2, frequency: 100, offset: 2.5 }] },
  run: { duration: 20e-3, points: 4000 },
});

// Three periods of a 1 kHz sine, large enough to clip a gain of about 10 on ±5 V.
const sineIntoClipping = () => ({
  input: { components: [{ kind: "sine" as const, amplitude: 0.5, frequency: 1e3 }] },
  run: { duration: 3e-3, points: 3000 },
});

export function blankScenario(kind: StageKind, name?: string): ScenarioInput {
  const base = { schema: SCENARIO_SCHEMA_ID, ...(name ? { name } : {}), opamp: { ...GENERIC_OPAMP } } as const;
  switch (kind) {
    case "noninverting-amplifier":
      // Gain 11 into ±5 V: a 0.5 V, 1 kHz sine just clips.
      return {
        ...base,
        supply: DUAL_5V,
        stage: { kind, rGround: 10e3, rFeedback: 100e3, reference: 0 },
        ...sineIntoClipping(),
      };
    case "inverting-amplifier":
      return {
        ...base,
        supply: DUAL_5V,
        stage: { kind, rInput: 10e3, rFeedback: 100e3, reference: 0 },
        ...sineIntoClipping(),
      };
    case "comparator":
      return {
        ...base,
        supply: SINGLE_5V,
        stage: { kind, reference: 2.5, inputAt: "noninverting" },
        ...sweepAcrossMidSupply(),
      };
    case "schmitt-noninverting":
      return {
        ...base,
        supply: SINGLE_5V,
        stage: { kind, rInput: 10e3, rFeedback: 100e3, reference: 2.5 },
        ...sweepAcrossMidSupply(),
      };
    case "schmitt-inverting":
      return {
        ...base,
        supply: SINGLE_5V,
        stage: { kind, rReference: 10e3, rFeedback: 100e3, reference: 2.5 },
        ...sweepAcrossMidSupply(),
      };
    case "relaxation-oscillator":
      // About 1 kHz: R·C = 0.47 ms, half the output fed back → period ≈ 2·RC·ln 3 (textbook astable, from memory).
      return {
        ...base,
        supply: SINGLE_5V,
        stage: { kind, rReference: 100e3, rFeedback: 100e3, rTiming: 10e3, cTiming: 47e-9, reference: 2.5 },
        input: { components: [{ kind: "dc", level: 0 }] },
        run: { duration: 5e-3, points: 5000 },
      };
  }
}
