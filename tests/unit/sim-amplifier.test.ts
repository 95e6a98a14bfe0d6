import { describe, expect, it } from "vitest";
import FFT from "fft.js";
import { simulate } from "@/lib/sim";
import { scenario } from "./sim-fixtures";

// Clipped sine through a gain stage, slew limiting and the single-pole closed loop.

/** Amplitude of harmonic h of a signal holding `cycles` whole periods in `n` samples (fft.js). */
function harmonic(x: Float64Array, cycles: number, h: number): number {
  const n = x.length;
  const f = new FFT(n);
  const out = f.createComplexArray();
  f.realTransform(out, Array.from(x));
  f.completeSpectrum(out);
  const k = cycles * h;
  return (2 * Math.hypot(out[2 * k], out[2 * k + 1])) / n;
}

describe("clipped sine (saturation describing function)", () => {
  // tests/REFERENCES.md "Clipped sine" [derived]: θc = asin(Vr/a); clipped share 1 − 2θc/π;
  // b1 = (2a/π)(θc + (Vr/a)·cos θc) (Gelb & Vander Velde 1968); a = 2, Vr = 1:
  // clipped 66.67 %, b1 = 1.217996, b3 = 0.275664.
  const N = 4096;
  const cycles = 4;
  const f = 1000;
  const run = (amplitude: number) =>
    simulate(
      scenario({
        supply: { positive: 1, negative: -1 },
        stage: { kind: "noninverting-amplifier", rGround: 1e3, rFeedback: 1e3, reference: 0 },
        input: { components: [{ kind: "sine", amplitude, frequency: f }] },
        run: { duration: cycles / f, points: N + 1 },
      }),
    );

  it("a = 2, Vr = 1: clipped fraction, fundamental and third harmonic", () => {
    const r = run(1);
    const a = 2;
    const thc = Math.asin(1 / a);
    expect(r.metrics.clippedFraction).toBeCloseTo(1 - (2 * thc) / Math.PI, 3);
    expect(r.metrics.clippedFraction).toBeCloseTo(0.6667, 3);
    const y = r.output.slice(0, N); // whole periods, the last sample repeats the first
    const b1 = harmonic(y, cycles, 1);
    const b3 = harmonic(y, cycles, 3);
    expect(b1).toBeCloseTo(((2 * a) / Math.PI) * (thc + (1 / a) * Math.cos(thc)), 3);
    expect(b1).toBeCloseTo(1.217996, 3);
    expect(b3).toBeCloseTo(0.275664, 3);
    // odd harmonics only
    expect(harmonic(y, cycles, 2)).toBeLessThan(2e-3);
  });

  it("a = 1.25, Vr = 1: clipped 40.97 %, b1 = 1.119890", () => {
    const r = run(0.625);
    expect(r.metrics.clippedFraction).toBeCloseTo(0.4097, 3);
    expect(harmonic(r.output.slice(0, N), cycles, 1)).toBeCloseTo(1.11989, 3);
  });
});

describe("slew rate", () => {
  const follower = { kind: "noninverting-amplifier", rGround: 1e12, rFeedback: 1, reference: 0 };

  it("a fully slew-limited sine becomes a triangle of slope ±SR and peak SR/(4f)", () => {
    // tests/REFERENCES.md "Slew rate" [derived]: 0.5 V/µs at 100 kHz → 1.25 V peak.
    const f = 1e5;
    const r = simulate(
      scenario({
        supply: { positive: 15, negative: -15 },
        opamp: {
          openLoopGain: 2e5,
          gainBandwidth: 10e6,
          slewRate: 0.5e6,
          outputHeadroomHigh: 0,
          outputHeadroomLow: 0,
          inputOffset: 0,
        },
        stage: follower,
        input: { components: [{ kind: "sine", amplitude: 10, frequency: f }] },
        run: { duration: 100 / f, points: 100 * 1024 + 1 },
      }),
    );
    // Peak-to-peak over the last two periods (a slewing output may still carry a decaying offset).
    const last = r.output.slice(-1024 * 2);
    const pp = Math.max(...last) - Math.min(...last);
    // The 1024-point grid can miss the peak by at most SR·T/1024 = 5 mV.
    expect(Math.abs(pp / 2 - 0.5e6 / (4 * f))).toBeLessThan(6e-3);
    expect(r.metrics.maxSlewRate).toBeCloseTo(0.5e6, 0);
  });

  it("full-power bandwidth SR/(2π·Vp): below it the output follows, above it slews", () => {
    // Full-power bandwidth f = SR/(2π·Vp), the textbook slew-rate relation (Sedra & Smith,
    // Microelectronic Circuits, op-amp slew-rate section) [published form]; SR = 2 V/µs, Vp = 12 V
    // → 26.53 kHz [derived from that formula].
    const fp = 2e6 / (2 * Math.PI * 12);
    expect(fp).toBeCloseTo(26526, -1);
    const at = (f: number) =>
      simulate(
        scenario({
          supply: { positive: 15, negative: -15 },
          opamp: {
            openLoopGain: 2e5,
            gainBandwidth: 100e6,
            slewRate: 2e6,
            outputHeadroomHigh: 0,
            outputHeadroomLow: 0,
            inputOffset: 0,
          },
          stage: follower,
          input: { components: [{ kind: "sine", amplitude: 12, frequency: f }] },
          run: { duration: 20 / f, points: 2001, initialOutput: "low" },
        }),
      ).metrics.maxSlewRate;
    const below = at(0.9 * fp);
    expect(below).toBeLessThan(2e6);
    expect(below).toBeCloseTo(2 * Math.PI * 0.9 * fp * 12, -3);
    expect(at(1.2 * fp)).toBeCloseTo(2e6, 0);
  });

  it("a separate falling slew rate is honoured", () => {
    // DEVELOPERS.md § Behavioural op-amp model: dvo/dt clamped to [−SRfall, +SR].
    const r = simulate(
      scenario({
        opamp: {
          openLoopGain: 2e5,
          gainBandwidth: 1e9,
          slewRate: 1e6,
          slewRateFall: 4e6,
          outputHeadroomHigh: 0,
          outputHeadroomLow: 0,
          inputOffset: 0,
        },
        stage: { kind: "comparator", reference: 0, inputAt: "noninverting" },
        input: { components: [{ kind: "pulse", low: -1, high: 1, period: 1e-3, duty: 0.5 }] },
        run: { duration: 2e-3, points: 2001 },
      }),
    );
    // 10–90 % of a 10 V swing: 8 V at 1 V/µs = 8 µs rising, 2 µs falling.
    expect(r.metrics.riseTime!).toBeCloseTo(8e-6, 8);
    expect(r.metrics.fallTime!).toBeCloseTo(2e-6, 8);
    expect(r.metrics.maxSlewRate).toBe(4e6);
    // Every input step gives an edge: the output leaves the rail at each step and slews
    // through 0 V 5 V / SR later (5 µs rising at 1 V/µs, 1.25 µs falling at 4 V/µs) [derived].
    // (A rail left at an input step used to be held for the whole next half period.)
    const expected = [
      ["rising", 5e-6],
      ["falling", 0.5e-3 + 1.25e-6],
      ["rising", 1e-3 + 5e-6],
      ["falling", 1.5e-3 + 1.25e-6],
    ] as const;
    expect(r.events.map((e) => e.edge)).toEqual(expected.map((e) => e[0]));
    r.events.forEach((e, i) => expect(e.time).toBeCloseTo(expected[i][1], 12));
  });
});

describe("single-pole closed loop", () => {
  it("step response time constant and finite-gain error A/(1+Aβ)", () => {
    // tests/REFERENCES.md "Single-pole op-amp": τ = noise gain/(2π·GBW) [derived]; closed-loop gain
    // with finite A is A/(1 + Aβ): A = 1e5, β = 0.01 → 99.900 [published form].
    // With the pole of DEVELOPERS.md's op-amp model (dvo/dt = ωp(A0·vd − vo), ωp = 2π·GBW/A0) the exact closed-loop
    // rate is ωp(1 + A0β); the pole formula above is its large-A0 limit.
    const A = 1e5;
    const gbw = 1e6;
    const beta = 0.01;
    const step = 0.01;
    const t0 = 1e-3;
    const r = simulate(
      scenario({
        supply: { positive: 15, negative: -15 },
        opamp: {
          openLoopGain: A,
          gainBandwidth: gbw,
          slewRate: 1e9,
          outputHeadroomHigh: 0,
          outputHeadroomLow: 0,
          inputOffset: 0,
        },
        stage: { kind: "noninverting-amplifier", rGround: 1e3, rFeedback: 99e3, reference: 0 },
        input: { components: [{ kind: "pulse", low: 0, high: step, period: 1, duty: 0.5, delay: t0 }] },
        run: { duration: 1.2e-3, points: 12001, initialOutput: "high" },
      }),
    );
    const gain = A / (1 + A * beta);
    expect(gain).toBeCloseTo(99.9, 3);
    const final = step * gain;
    const tau = 1 / (((2 * Math.PI * gbw) / A) * (1 + A * beta));
    // ≈ noise gain/(2π·GBW) = 15.92 µs, within 1/(A0β) = 0.1 %
    expect(Math.abs(tau / (100 / (2 * Math.PI * gbw)) - 1)).toBeLessThan(1.1e-3);
    let worst = 0;
    for (let i = 0; i < r.t.length; i++) {
      const t = r.t[i];
      if (t <= t0) continue;
      const expected = final * (1 - Math.exp(-(t - t0) / tau));
      worst = Math.max(worst, Math.abs(r.output[i] - expected));
    }
    // Before the step the output has settled to 0 from the +15 V start (≈ 63 τ).
    expect(worst).toBeLessThan(1e-6 * final);
    expect(r.output[r.output.length - 1]).toBeCloseTo(final * (1 - Math.exp(-(1.2e-3 - t0) / tau)), 9);
  });

  it("inverting stage: gain −rF/rI, noise gain 1 + rF/rI sets τ", () => {
    // Noise gain 1 + rFb/rIn (tests/REFERENCES.md, from memory); ideal gain −rF/rI.
    const gbw = 1e6;
    const A = 2e5;
    const r = simulate(
      scenario({
        supply: { positive: 15, negative: -15 },
        opamp: {
          openLoopGain: A,
          gainBandwidth: gbw,
          slewRate: 1e9,
          outputHeadroomHigh: 0,
          outputHeadroomLow: 0,
          inputOffset: 0,
        },
        stage: { kind: "inverting-amplifier", rInput: 1e3, rFeedback: 9e3, reference: 0 },
        input: { components: [{ kind: "pulse", low: 0, high: 0.1, period: 1, duty: 0.5, delay: 5e-5 }] },
        run: { duration: 1e-4, points: 1001, initialOutput: "high" },
      }),
    );
    const beta = 0.1; // rI/(rI + rF)
    const final = -0.1 * 0.9 * (A / (1 + A * beta)); // α·A/(1 + Aβ), α = rF/(rI + rF)
    expect(final).toBeCloseTo(-0.9, 3);
    const tau = 1 / (((2 * Math.PI * gbw) / A) * (1 + A * beta));
    const i = r.t.findIndex((t) => t >= 5e-5 + 2 * tau);
    const expected = final * (1 - Math.exp(-(r.t[i] - 5e-5) / tau));
    expect(r.output[i]).toBeCloseTo(expected, 7);
  });
});
