// Open-drain output (lib/schemas/README.md § The circuit as built: open-drain): low at Vol while the op-amp
// drives low; with the output transistor off the pin sits where the pull-up, the load and the
// feedback network put it.
import { describe, expect, it } from "vitest";
import { simulate } from "@/lib/sim";
import { FAST_OPAMP, scenario } from "./sim-fixtures";

const tri = (low: number, high: number, frequency: number) => ({
  components: [{ kind: "triangle", amplitude: (high - low) / 2, frequency, offset: (high + low) / 2 }],
});

describe("open-drain comparator", () => {
  const Rp = 10e3;
  const Vp = 3.3;
  const RL = 100e3;
  const make = (solver?: "odex") =>
    scenario({
      supply: { positive: 5, negative: 0 },
      opamp: { ...FAST_OPAMP, gainBandwidth: 1e8, slewRate: 1e7, slewRateFall: 5e6, outputHeadroomLow: 0.1 },
      stage: { kind: "comparator", reference: 2.5, inputAt: "noninverting" },
      output: { kind: "open-drain", pullUp: Rp, pullUpTo: Vp, load: { r: RL, to: 0 } },
      // steps 1 V → 4 V → 1 V: far past the reference, so the edges are slew-limited
      input: { components: [{ kind: "pulse", low: 1, high: 4, period: 1e-3, duty: 0.5, delay: 0.25e-3 }] },
      run: { duration: 2e-3, points: 4001, ...(solver ? { solver } : {}) },
    });

  it("high level is the divider of pull-up and load, low level is Vol", () => {
    // With the transistor off: V = Vp·RL/(Rp + RL) [derived, Ohm's law / voltage divider rule]
    const high = (Vp * RL) / (Rp + RL);
    const r = simulate(make());
    expect(r.rails.high).toBeCloseTo(high, 9);
    expect(r.rails.low).toBeCloseTo(0.1, 12);
    let max = -Infinity;
    let min = Infinity;
    for (const v of r.output) {
      max = Math.max(max, v);
      min = Math.min(min, v);
    }
    expect(max).toBeCloseTo(high, 9);
    expect(min).toBeCloseTo(0.1, 12);
    expect(r.events.length).toBe(4);
  });

  it("rises at slewRate and falls at slewRateFall between the loaded high level and Vol", () => {
    // 10–90 % edge of a ramp at slew rate S over a swing ΔV: 0.8·ΔV/S (common practice, no source)
    const high = (Vp * RL) / (Rp + RL);
    const swing = high - 0.1;
    const r = simulate(make());
    expect(r.metrics.riseTime!).toBeCloseTo((0.8 * swing) / 1e7, 9);
    expect(r.metrics.fallTime!).toBeCloseTo((0.8 * swing) / 5e6, 9);
  });

  it("odex (independent integrator, cross-check) gives the same edges and levels", () => {
    const a = simulate(make());
    const b = simulate(make("odex"));
    expect(b.events.length).toBe(a.events.length);
    for (let i = 0; i < a.events.length; i++) expect(Math.abs(a.events[i].time - b.events[i].time)).toBeLessThan(1e-8);
    expect(b.rails.high).toBeCloseTo(a.rails.high, 9);
  });
});

describe("open-drain non-inverting Schmitt trigger", () => {
  // 5 V supply, 10 k pull-up to 5 V, 47 k load to 0 V, rInput 10 k, rFeedback 100 k, ref 2.5 V
  const rI = 10e3;
  const rF = 100e3;
  const ref = 2.5;
  const Rp = 10e3;
  const Vp = 5;
  const RL = 47e3;
  const Vol = 0;
  const make = (solver?: "odex") =>
    scenario({
      supply: { positive: 5, negative: 0 },
      opamp: { ...FAST_OPAMP, gainBandwidth: 1e7, slewRate: 1e8 },
      stage: { kind: "schmitt-noninverting", rInput: rI, rFeedback: rF, reference: ref },
      output: { kind: "open-drain", pullUp: Rp, load: { r: RL } },
      input: tri(0.5, 4.5, 50),
      run: { duration: 0.04, points: 2001, ...(solver ? { solver } : {}) },
    });

  /**
   * Switching input where v+ = ref, with the pin at its loaded level [derived, nodal analysis]:
   *   KCL at the pin:  (Vp − v)/Rp + (0 − v)/RL + (u − v)/(rI + rF) = 0
   *   divider at v+:   (u·rF + v·rI)/(rI + rF) = ref
   * two linear equations in (u, v), solved by Cramer's rule.
   */
  function lowerThreshold(): { u: number; v: number } {
    const gF = 1 / (rI + rF);
    // a11·u + a12·v = b1 ; a21·u + a22·v = b2
    const a11 = gF;
    const a12 = -(1 / Rp + 1 / RL + gF);
    const b1 = -Vp / Rp;
    const a21 = rF;
    const a22 = rI;
    const b2 = ref * (rI + rF);
    const det = a11 * a22 - a12 * a21;
    return { u: (b1 * a22 - a12 * b2) / det, v: (a11 * b2 - a21 * b1) / det };
  }
  // Rising threshold: the pin is at Vol, u = (ref·(rI + rF) − Vol·rI)/rF [derived, same divider]
  const upper = (ref * (rI + rF) - Vol * rI) / rF;
  // Pin level with the transistor off at input u (same KCL, solved for v)
  const pinAt = (u: number) => (Vp / Rp + u / (rI + rF)) / (1 / Rp + 1 / RL + 1 / (rI + rF));

  it("thresholds match the closed form with the loaded high level", () => {
    const r = simulate(make());
    const lo = lowerThreshold();
    // The readings are the input at the output edge: the triangle (400 V/s) moves on by
    // slope × propagation delay (≈ 1.4 µs here) meanwhile, ≈ 0.6 mV.
    const lag = 400 * r.metrics.propagationDelay!;
    expect(lag).toBeLessThan(1e-3);
    expect(Math.abs(r.metrics.upperThreshold! - (upper + lag))).toBeLessThan(1e-4);
    expect(Math.abs(r.metrics.lowerThreshold! - (lo.u - lag))).toBeLessThan(1e-4);
    // The loaded level moves the lower threshold away from the push-pull value
    // ref·(rI + rF)/rF − Voh·rI/rF with Voh = 5 V, by more than the tolerance above.
    const pushPull = (ref * (rI + rF) - 5 * rI) / rF;
    expect(Math.abs(lo.u - pushPull)).toBeGreaterThan(0.05);
    // rails.high: the loaded level at the first high state (just after the upward crossing)
    expect(Math.abs(r.rails.high - pinAt(upper))).toBeLessThan(1e-3);
    // while high, the pin follows the input through rFeedback
    const i = r.output.findIndex((v, k) => k > 0 && r.input[k] > 4.4 && v > 2.5);
    expect(i).toBeGreaterThan(0);
    expect(r.output[i]).toBeCloseTo(pinAt(r.input[i]), 9);
  });

  it("odex (independent integrator of the same model, cross-check) agrees", () => {
    const a = simulate(make());
    const b = simulate(make("odex"));
    expect(a.events.length).toBeGreaterThanOrEqual(3);
    expect(b.events.length).toBe(a.events.length);
    for (let i = 0; i < a.events.length; i++) expect(Math.abs(a.events[i].time - b.events[i].time)).toBeLessThan(1e-8);
    expect(b.metrics.lowerThreshold!).toBeCloseTo(a.metrics.lowerThreshold!, 6);
    let d = 0;
    for (let k = 0; k < a.output.length; k++) d = Math.max(d, Math.abs(a.output[k] - b.output[k]));
    expect(d).toBeLessThan(1e-6);
  });

  it("with an RC filter the pin's high level follows the filter node", () => {
    // odex cross-check of the second state (filter node) with the loaded high level
    const withFilter = (solver?: "odex") =>
      scenario({
        ...{ supply: { positive: 5, negative: 0 }, opamp: { ...FAST_OPAMP, gainBandwidth: 1e7, slewRate: 1e8 } },
        stage: { kind: "schmitt-noninverting", rInput: rI, rFeedback: rF, reference: ref },
        output: { kind: "open-drain", pullUp: Rp, load: { r: RL } },
        filter: { r: 10e3, c: 100e-9 },
        input: tri(0.5, 4.5, 50),
        run: { duration: 0.04, points: 2001, ...(solver ? { solver } : {}) },
      });
    const a = simulate(withFilter());
    const b = simulate(withFilter("odex"));
    expect(a.events.length).toBeGreaterThanOrEqual(3);
    expect(b.events.length).toBe(a.events.length);
    for (let i = 0; i < a.events.length; i++) expect(Math.abs(a.events[i].time - b.events[i].time)).toBeLessThan(1e-8);
  });
});
