// RC low-pass filter node before the stage input (lib/schemas/README.md § The circuit as built: filter).
import { describe, expect, it } from "vitest";
import { simulate } from "@/lib/sim";
import { FAST_OPAMP, scenario } from "./sim-fixtures";

describe("RC filter before the stage", () => {
  const R = 10e3;
  const C = 100e-9;
  const Vstep = 4;
  const Vth = 2.5;
  const t0 = 1e-3;
  const make = (stage: Record<string, unknown>, solver?: "odex") =>
    scenario({
      supply: { positive: 5, negative: 0 },
      opamp: FAST_OPAMP,
      stage,
      filter: { r: R, c: C },
      input: { components: [{ kind: "pulse", low: 0, high: Vstep, period: 1, duty: 0.5, delay: t0 }] },
      run: { duration: 5e-3, points: 1001, ...(solver ? { solver } : {}) },
    });

  it("comparator: the edge comes RC·ln(Vstep/(Vstep − Vth)) after the step", () => {
    // RC charging: v(t) = Vstep·(1 − e^{−t/RC}) reaches Vth at t = RC·ln(Vstep/(Vstep − Vth))
    // [published: the first-order RC step response, e.g. Horowitz & Hill, The Art of Electronics, 1.4]
    const r = simulate(make({ kind: "comparator", reference: Vth, inputAt: "noninverting" }));
    const rising = r.events.filter((e) => e.edge === "rising");
    expect(rising).toHaveLength(1);
    const expected = t0 + R * C * Math.log(Vstep / (Vstep - Vth));
    // The stage's own response adds a delay: far inside its open-loop time constant the output
    // integrates the ramping vd, vo ≈ 2π·GBW·s·τ²/2 with s = dx/dt at the crossing, so it reaches
    // mid-level (2.5 V) τ = √(2·2.5/(2π·GBW·s)) ≈ 0.73 µs later [derived, common practice].
    const s = (Vstep - Vth) / (R * C);
    const response = Math.sqrt((2 * 2.5) / (2 * Math.PI * FAST_OPAMP.gainBandwidth * s));
    expect(Math.abs(rising[0].time - expected)).toBeLessThan(1e-6);
    expect(Math.abs(rising[0].time - (expected + response))).toBeLessThan(2e-8);
    // the filter node is reported and follows the same charging curve
    const f = r.filtered!;
    const i = r.t.findIndex((t) => t >= t0 + R * C);
    expect(f[i]).toBeCloseTo(Vstep * (1 - Math.exp(-(r.t[i] - t0) / (R * C))), 6);
  });

  it("current-drawing Schmitt input: exact agrees with odex", () => {
    // odex: independent integrator of the same equations (cross-check, common practice)
    const stage = { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 100e3, reference: 2.5 };
    const slow = { ...FAST_OPAMP, gainBandwidth: 1e6, slewRate: 1e7 };
    const build = (solver?: "odex") =>
      scenario({
        supply: { positive: 5, negative: 0 },
        opamp: slow,
        stage,
        filter: { r: R, c: C },
        input: { components: [{ kind: "pulse", low: 0, high: Vstep, period: 4e-3, duty: 0.5, delay: 5e-4 }] },
        run: { duration: 5e-3, points: 1001, ...(solver ? { solver } : {}) },
      });
    const a = simulate(build());
    const b = simulate(build("odex"));
    expect(a.events.length).toBeGreaterThan(0);
    expect(b.events.length).toBe(a.events.length);
    for (let i = 0; i < a.events.length; i++) expect(Math.abs(a.events[i].time - b.events[i].time)).toBeLessThan(1e-8);
  });
});
