import { describe, expect, it } from "vitest";
import { simulate } from "@/lib/sim";
import { scenario } from "./sim-fixtures";

// Relaxation oscillator (Schmitt trigger with an RC on v−).
describe("relaxation oscillator period", () => {
  it("dual supply: T = 2RC·ln((1+β)/(1−β)); β = 0.5 → 2.197 RC", () => {
    // REFERENCES.md "Relaxation oscillator" [published]: Sedra & Smith; Wikipedia
    // "Relaxation oscillator".
    const R = 100e3;
    const C = 10e-9;
    const r = simulate(
      scenario({
        supply: { positive: 5, negative: -5 },
        stage: { kind: "relaxation-oscillator", rReference: 10e3, rFeedback: 10e3, rTiming: R, cTiming: C, reference: 0 },
        run: { duration: 0.03, points: 3001 },
      }),
    );
    const beta = 0.5;
    const T = 2 * R * C * Math.log((1 + beta) / (1 - beta));
    expect(T / (R * C)).toBeCloseTo(2.197, 3);
    expect(r.metrics.period! / T).toBeCloseTo(1, 4);
    expect(r.metrics.dutyCycle!).toBeCloseTo(0.5, 4);
    // The capacitor starts at 0 V, so the first half period is shorter; the rest are periodic.
    expect(r.metrics.transitions).toBeGreaterThan(20);
    // No input reaches the stage, so there are no input-referred thresholds (DESIGN.md).
    expect(r.metrics.upperThreshold).toBeNull();
    expect(r.metrics.hysteresis).toBeNull();
  });

  it("single 5 V supply, thresholds Vcc/3 and 2Vcc/3: f = 1/(2RC·ln 2) = 9.618 kHz", () => {
    // REFERENCES.md [derived]: R = 100 kΩ, C = 750 pF, rail-to-rail → 9.618 kHz. The
    // three-equal-resistor divider is entered as its Thevenin form (Vcc/2 through R/2).
    const r = simulate(
      scenario({
        supply: { positive: 5, negative: 0 },
        stage: { kind: "relaxation-oscillator", rReference: 50e3, rFeedback: 100e3, rTiming: 100e3, cTiming: 750e-12, reference: 2.5 },
        run: { duration: 2e-3, points: 2001 },
      }),
    );
    expect(1 / r.metrics.period!).toBeCloseTo(9618, -1);
    expect(Math.abs(1 / r.metrics.period! / (1 / (2 * 100e3 * 750e-12 * Math.LN2)) - 1)).toBeLessThan(1e-3);
  });

  it("asymmetric limits follow t_high = RC·ln((Voh − VL)/(Voh − VH)), t_low = RC·ln((VH − Vol)/(VL − Vol))", () => {
    // REFERENCES.md [derived]: general half-period formulas.
    const R = 47e3;
    const C = 22e-9;
    const voh = 12 - 1.5;
    const vol = -12 + 0.5;
    const rRef = 22e3;
    const rFb = 68e3;
    const vref = 1;
    const VH = (vref * rFb + voh * rRef) / (rRef + rFb);
    const VL = (vref * rFb + vol * rRef) / (rRef + rFb);
    const r = simulate(
      scenario({
        supply: { positive: 12, negative: -12 },
        opamp: { openLoopGain: 2e5, gainBandwidth: 1e9, slewRate: 1e10, outputHeadroomHigh: 1.5, outputHeadroomLow: 0.5, inputOffset: 0 },
        stage: { kind: "relaxation-oscillator", rReference: rRef, rFeedback: rFb, rTiming: R, cTiming: C, reference: vref },
        run: { duration: 0.05, points: 5001 },
      }),
    );
    const tHigh = R * C * Math.log((voh - VL) / (voh - VH));
    const tLow = R * C * Math.log((VH - vol) / (VL - vol));
    expect(r.metrics.period! / (tHigh + tLow)).toBeCloseTo(1, 4);
    expect(r.metrics.dutyCycle!).toBeCloseTo(tHigh / (tHigh + tLow), 4);
  });
});
