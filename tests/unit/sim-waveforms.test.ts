import { describe, expect, it } from "vitest";
import { evaluateInput } from "@/lib/sim";
import { scenario } from "./sim-fixtures";

// Waveform conventions of lib/schemas/README.md § Scenario JSON: sine and triangle equal `offset` at t = 0
// and rise first (phase shifts both); ramp holds `from` before `start` and `to` after
// `start + duration`; pulse starts low and rises after `delay`; pwl and capture interpolate
// linearly and hold their end values. Closed forms below are the textbook definitions.
const at = (components: unknown[], times: number[]) =>
  Array.from(evaluateInput(scenario({ input: { components } }), Float64Array.from(times)));

describe("input waveform conventions", () => {
  it("dc", () => {
    expect(at([{ kind: "dc", level: 1.5 }], [0, 0.3])).toEqual([1.5, 1.5]);
  });

  it("sine: offset at t = 0, rising first; phase in degrees", () => {
    const [v0, v1, vq] = at([{ kind: "sine", amplitude: 2, frequency: 50, offset: 1 }], [0, 1e-4, 0.005]);
    expect(v0).toBe(1);
    expect(v1).toBeGreaterThan(1);
    expect(vq).toBeCloseTo(3, 12); // quarter period: offset + amplitude
    const [p0] = at([{ kind: "sine", amplitude: 2, frequency: 50, phase: 90, offset: 1 }], [0]);
    expect(p0).toBeCloseTo(3, 12);
    const t = 0.0123;
    expect(at([{ kind: "sine", amplitude: 2, frequency: 50, phase: 30 }], [t])[0]).toBeCloseTo(
      2 * Math.sin(2 * Math.PI * 50 * t + Math.PI / 6),
      12,
    );
  });

  it("triangle: offset at t = 0, rising first, peaks at T/4, vertices linear between", () => {
    const c = { kind: "triangle", amplitude: 2, frequency: 100, offset: 0.5 };
    const [v0, vq, vh, v3q, v1, v8] = at([c], [0, 0.0025, 0.005, 0.0075, 0.01, 0.001]);
    expect(v0).toBe(0.5);
    expect(vq).toBeCloseTo(2.5, 12);
    expect(vh).toBeCloseTo(0.5, 12);
    expect(v3q).toBeCloseTo(-1.5, 12);
    expect(v1).toBeCloseTo(0.5, 12);
    expect(v8).toBeCloseTo(0.5 + 2 * 0.4, 12); // slope 4·A·f
    // phase 90° starts at the peak
    expect(at([{ ...c, phase: 90 }], [0])[0]).toBeCloseTo(2.5, 12);
  });

  it("ramp: holds before start and after start + duration", () => {
    const c = { kind: "ramp", from: -1, to: 3, start: 0.1, duration: 0.2 };
    expect(at([c], [0, 0.1, 0.2, 0.3, 0.5])).toEqual([-1, -1, 1, 3, 3].map((x) => expect.closeTo(x, 12)));
  });

  it("pulse: starts low, rises after delay, duty from rise start to fall start", () => {
    const c = { kind: "pulse", low: 0, high: 5, period: 1e-3, duty: 0.25, rise: 1e-5, fall: 2e-5, delay: 1e-4 };
    const v = at([c], [0, 9.99e-5, 1.05e-4, 1.2e-4, 3.4e-4, 3.6e-4, 3.8e-4, 1.1e-3 + 1e-4]);
    expect(v[0]).toBe(0);
    expect(v[1]).toBe(0);
    expect(v[2]).toBeCloseTo(2.5, 9); // half-way up the 10 µs rise
    expect(v[3]).toBe(5);
    expect(v[4]).toBe(5); // high until delay + duty·period = 350 µs
    expect(v[5]).toBeCloseTo(2.5, 9); // half-way down the 20 µs fall
    expect(v[6]).toBe(0);
    expect(v[7]).toBe(5); // next period
  });

  it("pwl: linear between points, holds its ends, steps at repeated times", () => {
    const c = {
      kind: "pwl",
      points: [
        [0.1, 1],
        [0.2, 3],
        [0.2, -1],
        [0.4, 0],
      ],
    };
    expect(at([c], [0, 0.15, 0.1999999, 0.2, 0.3, 1])).toEqual(
      [1, 2, expect.closeTo(3, 5), -1, -0.5, 0].map((x) => (typeof x === "number" ? expect.closeTo(x, 12) : x)),
    );
  });

  it("capture: linear between samples, holds its ends", () => {
    const c = {
      kind: "capture",
      samples: [
        [0, 0],
        [1e-3, 2],
        [2e-3, 1],
      ],
    };
    expect(at([c], [0.5e-3, 1.5e-3, 5e-3])).toEqual([1, 1.5, 1].map((x) => expect.closeTo(x, 12)));
  });

  it("components add up", () => {
    const t = 0.0031;
    const sum = at(
      [
        { kind: "dc", level: 0.2 },
        { kind: "sine", amplitude: 1, frequency: 100 },
        { kind: "ramp", from: 0, to: 1, start: 0, duration: 0.01 },
      ],
      [t],
    )[0];
    expect(sum).toBeCloseTo(0.2 + Math.sin(2 * Math.PI * 100 * t) + t / 0.01, 12);
  });
});
