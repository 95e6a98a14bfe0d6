// The exact solver's parts on their own: the root bracketer, the closed-form basis and the
// closed form of a piece (lib/sim/exact/).
import { describe, expect, it } from "vitest";
import { Basis, SLOT_E1, SLOT_E2, SLOT_ONE, SLOT_SINES, SLOT_TAU, solveScalar } from "@/lib/sim/exact/basis";
import { BRACKET_B, bracketRoot, ulp, type Evaluator } from "@/lib/sim/exact/bracket";
import { PieceModel } from "@/lib/sim/exact/pieces";
import { Scanner } from "@/lib/sim/exact/scan";
import { Recorder } from "@/lib/sim/measure";
import {
  EXITS,
  LINEAR,
  RAIL_HIGH,
  RAIL_LOW,
  SLEW_DOWN,
  SLEW_UP,
  enterRegime,
  levelValues,
} from "@/lib/sim/exact/regimes";
import type { Network } from "@/lib/sim/network";

describe("bracketRoot", () => {
  /** The root of c on [a, b] (values ga, gb at the ends), through the typed-array bracket. */
  const rootOf = (f: Evaluator, c: Float64Array, a: number, b: number, ga: number, gb: number, t0: number) => {
    const bracket = Float64Array.of(a, b, ga, gb, t0);
    bracketRoot(f, c, bracket);
    return bracket[BRACKET_B];
  };
  const basisOf = (omega: number[]) => new Basis(Float64Array.from(omega));

  it("finds the zero of cos at π/2 to the time resolution, from the far side", () => {
    // cos(π/2) = 0 (textbook identity); c = cos(τ) in the basis with ω = 1
    const b = basisOf([1]);
    const c = new Float64Array(b.size);
    c[SLOT_SINES + 1] = 1;
    const root = rootOf(b, c, 0, 3, 1, Math.cos(3), 0);
    expect(Math.cos(root)).toBeLessThan(0); // on b's side
    expect(Math.abs(root - Math.PI / 2)).toBeLessThanOrEqual(4 * ulp(Math.PI / 2));
  });

  it("finds ln 2 as the zero of e^τ − 2 (both directions of the sign change)", () => {
    // e^{ln 2} = 2 (definition of the natural logarithm)
    const b = basisOf([]);
    b.setE1(1);
    const c = new Float64Array(b.size);
    c[SLOT_ONE] = -2;
    c[SLOT_E1] = 1;
    const up = rootOf(b, c, 0, 2, -1, Math.exp(2) - 2, 0);
    expect(Math.abs(up - Math.LN2)).toBeLessThanOrEqual(4 * ulp(Math.LN2));
    expect(b.valueAt(c, up)).toBeGreaterThanOrEqual(0);
    const neg = Float64Array.from(c, (v) => -v);
    const down = rootOf(b, neg, 0, 2, 1, 2 - Math.exp(2), 0);
    expect(Math.abs(down - Math.LN2)).toBeLessThanOrEqual(4 * ulp(Math.LN2));
    expect(b.valueAt(neg, down)).toBeLessThan(0);
  });

  it("resolves to the time resolution late in a long run (absolute time t0 = 1000 s)", () => {
    // common practice, no source: a root can only be located to the spacing of doubles at t0
    const b = basisOf([]);
    const c = new Float64Array(b.size);
    c[SLOT_ONE] = -1e-9;
    c[SLOT_TAU] = 1; // zero at τ = 1e-9
    const root = rootOf(b, c, 0, 1, -1e-9, 1 - 1e-9, 1000);
    expect(root).toBeGreaterThanOrEqual(1e-9);
    expect(root - 1e-9).toBeLessThanOrEqual(4 * ulp(1001));
  });
});

describe("Scanner (bounded walk)", () => {
  // A narrow hump of a real exponential pair plus a sine, the shape of a linear piece on a steep
  // input: c(τ) = 2e^{3m} + 0.005 − e^{3τ} − e^{6m}·e^{−3τ} + 0.02·sin(2πτ) (m = 0.515), whose
  // top of a few mV near τ = m pokes above 0 for about 0.02, between ends 14 below it. Truth by brute force: the sign of c on a grid of
  // 200,001 points (common practice, no source).
  const hump = () => {
    const b = new Basis(Float64Array.of(2 * Math.PI)); // one sine of period 1
    b.setRealPair(3, -3);
    const c = new Float64Array(b.size);
    const m = 0.515;
    c[SLOT_ONE] = 2 * Math.exp(3 * m) + 0.005;
    c[SLOT_E1] = -1;
    c[SLOT_E2] = -Math.exp(6 * m);
    c[SLOT_SINES] = 0.02; // + 0.02·sin(2πτ)
    return { b, c };
  };
  const bruteRoots = (b: Basis, c: Float64Array, tMax: number) => {
    const roots: number[] = [];
    let prev = b.valueAt(c, 0) >= 0;
    for (let i = 1; i <= 200_000; i++) {
      const tau = (tMax * i) / 200_000;
      const side = b.valueAt(c, tau) >= 0;
      if (side !== prev) roots.push(tau);
      prev = side;
    }
    return roots;
  };

  it("finds a hump whose ends are both below the level (first exit and both crossings)", () => {
    const { b, c } = hump();
    const truth = bruteRoots(b, c, 1);
    expect(truth.length).toBe(2); // the hump pokes above 0 between two points below it
    expect(b.valueAt(c, 0)).toBeLessThan(0);
    expect(b.valueAt(c, 1)).toBeLessThan(0);
    const scan = new Scanner(b);
    scan.start = 0;
    scan.span = 1;
    scan.firstExit(c);
    expect(Math.abs(scan.exit - truth[0])).toBeLessThan(1e-5);
    const pushed: number[] = [];
    const spy = new Recorder({ high: 1, low: 0 }, { valueAt: () => 0 } as never, 0);
    spy.pushCrossing = () => void pushed.push(spy.crossingTime);
    expect(scan.crossings(c, 0, false, spy)).toBe(false);
    expect(pushed.length).toBe(2);
    expect(Math.abs(pushed[0] - truth[0])).toBeLessThan(1e-5);
    expect(Math.abs(pushed[1] - truth[1])).toBeLessThan(1e-5);
  });

  it("dismisses a piece far from the level in one evaluation", () => {
    const { b, c } = hump();
    c[SLOT_ONE] -= 10; // now more than 9.9 below 0 everywhere (the hump's top is a few mV)
    const scan = new Scanner(b);
    const before = b.evaluations;
    scan.start = 0;
    scan.span = 0.01;
    scan.firstExit(c);
    expect(Number.isNaN(scan.exit)).toBe(true);
    expect(b.evaluations - before).toBe(1);
  });
});

describe("Basis", () => {
  it("evaluates 1, τ, exponentials and sines, and their slope at the start", () => {
    // The basis functions by definition; the slope against a central difference.
    const b = new Basis(Float64Array.of(3));
    b.setRealPair(-2, -5);
    const c = Float64Array.of(0.5, 1.5, 2, -1, 0.25, -0.75);
    const f = (t: number) =>
      0.5 + 1.5 * t + 2 * Math.exp(-2 * t) - Math.exp(-5 * t) + 0.25 * Math.sin(3 * t) - 0.75 * Math.cos(3 * t);
    for (const t of [0, 0.1, 0.7, 2]) expect(b.valueAt(c, t)).toBeCloseTo(f(t), 14);
    expect(b.valueAtStart(c)).toBeCloseTo(f(0), 15);
    const h = 1e-6;
    expect(b.slopeAtStart(c)).toBeCloseTo((f(h) - f(-h)) / (2 * h), 6);
    const d = new Float64Array(b.size);
    b.derivative(c, d);
    for (const t of [0.1, 0.9]) expect(b.valueAt(d, t)).toBeCloseTo((f(t + h) - f(t - h)) / (2 * h), 5);
  });

  it("evaluates a complex pair as e^{μτ}·cos ντ and e^{μτ}·sin ντ", () => {
    const b = new Basis(new Float64Array(0));
    b.setComplexPair(-0.5, 4);
    const c = Float64Array.of(0, 0, 1.25, -0.5);
    const f = (t: number) => Math.exp(-0.5 * t) * (1.25 * Math.cos(4 * t) - 0.5 * Math.sin(4 * t));
    for (const t of [0, 0.3, 1.1]) expect(b.valueAt(c, t)).toBeCloseTo(f(t), 14);
    const h = 1e-6;
    expect(b.slopeAtStart(c)).toBeCloseTo((f(h) - f(-h)) / (2 * h), 6);
  });

  it("solveScalar satisfies y' = k·y + f(τ) with y(0) = y0 (affine and sine forcing)", () => {
    // Linear first-order ODE, integrating-factor solution (any ODE textbook); checked by residual.
    const omega = Float64Array.of(7);
    const b = new Basis(omega);
    const k = -3;
    const force = Float64Array.of(2, -1, 0, 0, 0.8, 0.3);
    const y = new Float64Array(b.size);
    solveScalar(k, force, 1.5, omega, y);
    b.setE1(k);
    expect(b.valueAt(y, 0)).toBeCloseTo(1.5, 14);
    const forcing = (t: number) => 2 - t + 0.8 * Math.sin(7 * t) + 0.3 * Math.cos(7 * t);
    const h = 1e-6;
    for (const t of [0.05, 0.4, 1.3]) {
      const dy = (b.valueAt(y, t + h) - b.valueAt(y, t - h)) / (2 * h);
      expect(dy).toBeCloseTo(k * b.valueAt(y, t) + forcing(t), 5);
    }
  });
});

describe("PieceModel", () => {
  const constants = { openLoopGain: 1e3, gainBandwidth: 1e3, slewRate: 1e6, slewRateFall: 1e6, high: 5, low: -5 };

  it("a linear piece with a capacitor state satisfies both state equations (real and complex pairs)", () => {
    // vo' = ωp·(A0·vd − vo), x' = kappaU·u + kappaX·x + kappaO·vo + kappa0: residual check.
    for (const [gamma, complex] of [
      [-5, true],
      [-0.02, false],
    ] as const) {
      const net: Network = {
        alpha: 0.3,
        beta: -0.2,
        gamma,
        delta: 0.01,
        state: { kappaU: 50, kappaX: -80, kappaO: 30, kappa0: 2, start: "zero" },
        inverting: false,
        amplifier: false,
      };
      const model = new PieceModel(net, constants, Float64Array.of(40));
      const U = model.U;
      U[SLOT_ONE] = 0.4;
      U[SLOT_TAU] = -0.6;
      U[SLOT_SINES] = 0.2;
      U[SLOT_SINES + 1] = -0.1;
      model.startVo = 0.7;
      model.startX = -0.3;
      model.setup(LINEAR);
      const b = model.basis;
      expect(b.complex).toBe(complex);
      const u = (t: number) => 0.4 - 0.6 * t + 0.2 * Math.sin(40 * t) - 0.1 * Math.cos(40 * t);
      expect(b.valueAt(model.VO, 0)).toBeCloseTo(0.7, 12);
      expect(b.valueAt(model.X, 0)).toBeCloseTo(-0.3, 12);
      const wp = (2 * Math.PI * 1e3) / 1e3;
      const h = 1e-7;
      for (const t of [1e-4, 3e-3, 2e-2]) {
        const vo = b.valueAt(model.VO, t);
        const x = b.valueAt(model.X, t);
        const dvo = (b.valueAt(model.VO, t + h) - b.valueAt(model.VO, t - h)) / (2 * h);
        const dx = (b.valueAt(model.X, t + h) - b.valueAt(model.X, t - h)) / (2 * h);
        const vd = 0.3 * u(t) - 0.2 * vo + gamma * x + 0.01;
        expect(Math.abs(dvo - wp * (1e3 * vd - vo))).toBeLessThan(1e-5 * Math.max(1, Math.abs(dvo)));
        expect(Math.abs(dx - (50 * u(t) - 80 * x + 30 * vo + 2))).toBeLessThan(1e-5 * Math.max(1, Math.abs(dx)));
        expect(Math.abs(b.valueAt(model.DRIVE, t) - wp * (1e3 * vd - vo))).toBeLessThan(
          1e-9 * Math.max(1, Math.abs(dvo)),
        );
      }
    }
  });
});

describe("regime table", () => {
  const levels = levelValues(10, 8, 4, -4);
  it("enters rails only when the drive pushes into them, slews beyond the slew limits", () => {
    // The behavioural model of DEVELOPERS.md: clamp of dvo/dt to [−SRfall, SR] and of vo to [Vol, Voh].
    expect(enterRegime(4, 0.5, levels)).toBe(RAIL_HIGH);
    expect(enterRegime(4, -0.5, levels)).toBe(LINEAR);
    expect(enterRegime(-4, -20, levels)).toBe(RAIL_LOW);
    expect(enterRegime(0, 11, levels)).toBe(SLEW_UP);
    expect(enterRegime(0, -9, levels)).toBe(SLEW_DOWN);
    expect(enterRegime(0, 10, levels)).toBe(LINEAR);
  });
  it("slew regimes are left across the boundary they were entered by; rails are left on the drive", () => {
    // The behavioural model of DEVELOPERS.md: a slew ends where the drive returns inside the slew
    // limit; a rail is reached by the output and left when the drive turns away from it.
    for (const slew of [SLEW_UP, SLEW_DOWN]) {
      const into = EXITS[LINEAR].find((e) => e.to === slew)!;
      const back = EXITS[slew].find((e) => e.to === LINEAR)!;
      expect([back.quantity, back.level, back.sign]).toEqual([into.quantity, into.level, -into.sign]);
    }
    for (const rail of [RAIL_HIGH, RAIL_LOW]) {
      expect(EXITS[rail]).toHaveLength(1);
      expect(EXITS[rail][0].to).toBe(LINEAR);
      expect(EXITS[rail][0].sign).toBe(rail === RAIL_HIGH ? -1 : 1);
    }
  });
});
