import { describe, expect, it } from "vitest";
import { simulate } from "@/lib/sim";
import type { Scenario } from "@/lib/schemas/scenario";
import { scenario } from "./sim-fixtures";

// Relaxation oscillator (Schmitt trigger with an RC on v−).
describe("relaxation oscillator period", () => {
  it("dual supply: T = 2RC·ln((1+β)/(1−β)); β = 0.5 → 2.197 RC", () => {
    // tests/REFERENCES.md "Relaxation oscillator" [published]: Sedra & Smith; Wikipedia
    // "Relaxation oscillator".
    const R = 100e3;
    const C = 10e-9;
    const r = simulate(
      scenario({
        supply: { positive: 5, negative: -5 },
        stage: {
          kind: "relaxation-oscillator",
          rReference: 10e3,
          rFeedback: 10e3,
          rTiming: R,
          cTiming: C,
          reference: 0,
        },
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
    // No input reaches the stage, so there are no input-referred thresholds (lib/schemas/README.md § Result JSON).
    expect(r.metrics.upperThreshold).toBeNull();
    expect(r.metrics.hysteresis).toBeNull();
  });

  it("single 5 V supply, thresholds Vcc/3 and 2Vcc/3: f = 1/(2RC·ln 2) = 9.618 kHz", () => {
    // tests/REFERENCES.md [derived]: R = 100 kΩ, C = 750 pF, rail-to-rail → 9.618 kHz. The
    // three-equal-resistor divider is entered as its Thevenin form (Vcc/2 through R/2).
    const r = simulate(
      scenario({
        supply: { positive: 5, negative: 0 },
        stage: {
          kind: "relaxation-oscillator",
          rReference: 50e3,
          rFeedback: 100e3,
          rTiming: 100e3,
          cTiming: 750e-12,
          reference: 2.5,
        },
        run: { duration: 2e-3, points: 2001 },
      }),
    );
    expect(1 / r.metrics.period!).toBeCloseTo(9618, -1);
    expect(Math.abs(1 / r.metrics.period! / (1 / (2 * 100e3 * 750e-12 * Math.LN2)) - 1)).toBeLessThan(1e-3);
  });

  it("asymmetric limits follow t_high = RC·ln((Voh − VL)/(Voh − VH)), t_low = RC·ln((VH − Vol)/(VL − Vol))", () => {
    // tests/REFERENCES.md [derived]: general half-period formulas.
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
        opamp: {
          openLoopGain: 2e5,
          gainBandwidth: 1e9,
          slewRate: 1e10,
          outputHeadroomHigh: 1.5,
          outputHeadroomLow: 0.5,
          inputOffset: 0,
        },
        stage: {
          kind: "relaxation-oscillator",
          rReference: rRef,
          rFeedback: rFb,
          rTiming: R,
          cTiming: C,
          reference: vref,
        },
        run: { duration: 0.05, points: 5001 },
      }),
    );
    const tHigh = R * C * Math.log((voh - VL) / (voh - VH));
    const tLow = R * C * Math.log((VH - vol) / (VL - vol));
    expect(r.metrics.period! / (tHigh + tLow)).toBeCloseTo(1, 4);
    expect(r.metrics.dutyCycle!).toBeCloseTo(tHigh / (tHigh + tLow), 4);
  });
});

// Off-centre references: the output reaches a rail while the capacitor is still far from the
// threshold, and later leaves it on a grazing crossing (vd turns round just as the rail is held).
// The exact solver used to drop that rail exit and hold the output for the rest of the run.
describe("off-centre relaxation oscillators: exact agrees with odex and keeps switching", () => {
  const PART = {
    openLoopGain: 1e5,
    gainBandwidth: 10e6,
    slewRate: 20e6,
    outputHeadroomHigh: 0.2,
    outputHeadroomLow: 0.2,
    inputOffset: 0.002,
  };

  function check(s: Scenario, minEdges: number) {
    const st = s.stage;
    if (st.kind !== "relaxation-oscillator") throw new Error("oscillator expected");
    const exact = simulate(s);
    const odex = simulate(s, { solver: "odex" });
    expect(exact.events.length).toBeGreaterThanOrEqual(minEdges);
    expect(exact.events.length).toBe(odex.events.length);
    const period = odex.metrics.period!;
    for (let i = 0; i < exact.events.length; i++) {
      expect(exact.events[i].edge).toBe(odex.events[i].edge);
      expect(Math.abs(exact.events[i].time - odex.events[i].time)).toBeLessThan(1e-6 * period);
    }
    // Still switching at the end of the run: the last edge is within one period of the end.
    expect(s.run.duration - exact.events.at(-1)!.time).toBeLessThan(period);

    // Outside check — tests/REFERENCES.md "Relaxation oscillator", general form [derived]:
    // t_high = RC·ln((Voh − VL)/(Voh − VH)), t_low = RC·ln((VH − Vol)/(VL − Vol)) for an ideal
    // op-amp; the thresholds VH, VL are v+ at each output level plus the input offset (the
    // output switches when vc = v+ + Vos). Slew (≈ 0.5 µs per edge here) and GBW add a switching
    // time, so 1 % is allowed.
    const { high: voh, low: vol } = exact.rails;
    const s0 = st.rReference + st.rFeedback;
    const vos = s.opamp.inputOffset;
    const VH = (st.reference * st.rFeedback + voh * st.rReference) / s0 + vos;
    const VL = (st.reference * st.rFeedback + vol * st.rReference) / s0 + vos;
    const RC = st.rTiming * st.cTiming;
    const tHigh = RC * Math.log((voh - VL) / (voh - VH));
    const tLow = RC * Math.log((VH - vol) / (VL - vol));
    // Steady half-periods from the last full cycle (the first half period starts from vc = 0).
    const ev = exact.events;
    const k = ev.length - 3;
    const d1 = ev[k + 1].time - ev[k].time;
    const d2 = ev[k + 2].time - ev[k + 1].time;
    const [measHigh, measLow] = ev[k].edge === "rising" ? [d1, d2] : [d2, d1];
    expect(Math.abs(measHigh / tHigh - 1)).toBeLessThan(0.01);
    expect(Math.abs(measLow / tLow - 1)).toBeLessThan(0.01);
    expect(Math.abs(exact.metrics.period! / (tHigh + tLow) - 1)).toBeLessThan(0.01);
  }

  it("±5 V, reference −2.602 V through 24.46 kΩ, 51 kΩ feedback, 9.1 kΩ / 68 nF (starts high)", () => {
    check(
      scenario({
        supply: { positive: 5, negative: -5 },
        opamp: PART,
        stage: {
          kind: "relaxation-oscillator",
          rReference: 24459.183673469386,
          rFeedback: 51e3,
          reference: -2.6020408163265305,
          rTiming: 9.1e3,
          cTiming: 68e-9,
        },
        run: { duration: 4e-3, points: 4001, initialOutput: "high" },
      }),
      8,
    );
  });

  it("single 5 V supply, reference 1.5 V through 37.48 kΩ, 47 kΩ feedback, 10 kΩ / 100 nF (starts low)", () => {
    // The resistor value comes from a sweep: the old solver stopped after the first edge here.
    check(
      scenario({
        supply: { positive: 5, negative: 0 },
        opamp: PART,
        stage: {
          kind: "relaxation-oscillator",
          rReference: 37476.707796,
          rFeedback: 47e3,
          reference: 1.5,
          rTiming: 10e3,
          cTiming: 100e-9,
        },
        run: { duration: 0.01, points: 1001, initialOutput: "low" },
      }),
      6,
    );
  });
});
