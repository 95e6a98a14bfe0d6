// Stage topologies (lib/schemas/README.md § Stage topologies): the op-amp's differential input
// vd = v+ − v− + Vos is linear in the input u, the output vo and, when the stage has one, a
// capacitor voltage x (the oscillator's timing capacitor):
//   vd    = alpha·u + beta·vo + gamma·x + delta
//   dx/dt = kappaU·u + kappaX·x + kappaO·vo + kappa0
// The coefficients are written once per run; the solvers never look at the stage kind again.
import type { Scenario } from "@/lib/schemas/scenario";

export interface Network {
  alpha: number;
  beta: number;
  gamma: number;
  delta: number;
  /** The capacitor state x, or null for a stage without one. */
  state: CapacitorState | null;
  /** The input reaches v− (an upward input crossing gives a falling output edge). */
  inverting: boolean;
  /** Amplifier stages (negative feedback): no propagation-delay reading. */
  amplifier: boolean;
  /**
   * An open-drain output's high level: with the output transistor off the pin sits at
   * h0 + hU·u + hX·x (the Thevenin voltage of the pull-up, the load and the feedback network).
   * Absent (or null) for a push-pull output, whose high level is the constant Voh.
   */
  high?: HighLevel | null;
}

export interface HighLevel {
  h0: number;
  hU: number;
  hX: number;
}

export interface CapacitorState {
  kappaU: number;
  kappaX: number;
  kappaO: number;
  kappa0: number;
  /** How x starts: at 0 V, or at its steady value for the state at t = 0. */
  start: "zero" | "steady";
}

/** The stage's kinds that amplify (negative feedback) rather than switch. */
export function isAmplifierKind(kind: Scenario["stage"]["kind"]): boolean {
  return kind === "noninverting-amplifier" || kind === "inverting-amplifier";
}

/** run.initialOutput when the scenario leaves it out: "settled" for amplifiers, else "low". */
export function defaultInitialOutput(kind: Scenario["stage"]["kind"]): "low" | "settled" {
  return isAmplifierKind(kind) ? "settled" : "low";
}

/**
 * The DC operating point for input u at t = 0 (vo from vo = A0·vd with x at its steady value
 * when it has one), with vo clamped to the output limits; x then steady for that vo.
 */
export function settledState(
  net: Network,
  u: number,
  openLoopGain: number,
  rails: { high: number; low: number },
): { vo: number; x: number } {
  const A0 = openLoopGain;
  const s = net.state;
  // vd = driveU + loopBeta·vo at DC (x at its steady value for vo when the stage has a state)
  let driveU = net.alpha * u + net.delta;
  let loopBeta = net.beta;
  if (s !== null) {
    // x = −(kappaU·u + kappaO·vo + kappa0)/kappaX substituted into vd
    const xu = -s.kappaU / s.kappaX;
    const xo = -s.kappaO / s.kappaX;
    const x0 = -s.kappa0 / s.kappaX;
    driveU += net.gamma * (xu * u + x0);
    loopBeta += net.gamma * xo;
  }
  let vo: number;
  if (1 - A0 * loopBeta > 0) {
    // Degenerative (or open) loop: vo = A0·vd has one solution, and it is stable.
    vo = (A0 * driveU) / (1 - A0 * loopBeta);
    if (!(vo < rails.high)) vo = rails.high;
    if (!(vo > rails.low)) vo = rails.low;
  } else {
    // Regenerative loop (positive feedback, A0·loopBeta ≥ 1): the mid-level solution of
    // vo = A0·vd is an unstable balance that any disturbance leaves, not an operating point.
    // The operating points are the limits whose drive holds the output there (common practice,
    // no source). When both hold (input inside the hysteresis band) the stage starts low, as
    // the switching kinds do by default (defaultInitialOutput above).
    const holdsHigh = A0 * (driveU + loopBeta * rails.high) - rails.high >= 0;
    const holdsLow = A0 * (driveU + loopBeta * rails.low) - rails.low <= 0;
    vo = holdsLow || !holdsHigh ? rails.low : rails.high;
  }
  return { vo, x: s === null ? 0 : initialCapacitor(net, u, vo) };
}

/** The capacitor's start for output vo and input u at t = 0 (0 V or steady, per the network). */
export function initialCapacitor(net: Network, u: number, vo: number): number {
  const s = net.state;
  if (s === null || s.start === "zero") return 0;
  return -(s.kappaU * u + s.kappaO * vo + s.kappa0) / s.kappaX;
}

export function outputLimits(scenario: Scenario): { high: number; low: number } {
  return {
    high: scenario.supply.positive - scenario.opamp.outputHeadroomHigh,
    low: scenario.supply.negative + scenario.opamp.outputHeadroomLow,
  };
}

export function buildNetwork(scenario: Scenario): Network {
  const st = scenario.stage;
  const vos = scenario.opamp.inputOffset;
  const ref = st.reference;
  switch (st.kind) {
    case "noninverting-amplifier": {
      // v+ = u; v− = ref + (vo − ref)·rG/(rG + rF)
      const g = st.rGround / (st.rGround + st.rFeedback);
      return {
        alpha: 1,
        beta: -g,
        gamma: 0,
        delta: -ref * (1 - g) + vos,
        state: null,
        inverting: false,
        amplifier: true,
      };
    }
    case "inverting-amplifier": {
      // v+ = ref; v− = (u·rF + vo·rI)/(rI + rF)
      const s = st.rInput + st.rFeedback;
      return {
        alpha: -st.rFeedback / s,
        beta: -st.rInput / s,
        gamma: 0,
        delta: ref + vos,
        state: null,
        inverting: true,
        amplifier: true,
      };
    }
    case "comparator":
      return st.inputAt === "inverting"
        ? { alpha: -1, beta: 0, gamma: 0, delta: ref + vos, state: null, inverting: true, amplifier: false }
        : { alpha: 1, beta: 0, gamma: 0, delta: -ref + vos, state: null, inverting: false, amplifier: false };
    case "schmitt-noninverting": {
      // v+ = (u·rF + vo·rI)/(rI + rF); v− = ref
      const s = st.rInput + st.rFeedback;
      return {
        alpha: st.rFeedback / s,
        beta: st.rInput / s,
        gamma: 0,
        delta: -ref + vos,
        state: null,
        inverting: false,
        amplifier: false,
      };
    }
    case "schmitt-inverting": {
      // v+ = (ref·rF + vo·rR)/(rR + rF); v− = u
      const s = st.rReference + st.rFeedback;
      return {
        alpha: -1,
        beta: st.rReference / s,
        gamma: 0,
        delta: (ref * st.rFeedback) / s + vos,
        state: null,
        inverting: true,
        amplifier: false,
      };
    }
    case "relaxation-oscillator": {
      // As schmitt-inverting, but v− is the capacitor node (rTiming from vo, cTiming to 0 V);
      // the input signal is not connected to the stage.
      const s = st.rReference + st.rFeedback;
      const w = 1 / (st.rTiming * st.cTiming);
      return {
        alpha: 0,
        beta: st.rReference / s,
        gamma: -1,
        delta: (ref * st.rFeedback) / s + vos,
        // dx/dt = (vo − x)/(rTiming·cTiming); the capacitor starts at 0 V
        state: { kappaU: 0, kappaX: -w, kappaO: w, kappa0: 0, start: "zero" },
        inverting: true,
        amplifier: false,
      };
    }
  }
}

/**
 * The network with an RC low-pass (r, c to 0 V) between the input u and the stage input: the
 * filter node is the capacitor state x and the stage sees x where it saw u. On a high-impedance
 * input dx/dt = (u − x)/(r·c); where the stage input draws current through rInput to a node
 * (x·rF + vo·rI)/(rI + rF) (schmitt-noninverting, inverting-amplifier) the node also loses
 * (x − vo)/(rI + rF) (Kirchhoff's current law at the node). It starts at its steady value.
 */
export function withFilter(net: Network, scenario: Scenario, filter: { r: number; c: number }): Network {
  const st = scenario.stage;
  if (net.state !== null) throw new Error("filter is not for the relaxation oscillator");
  const w = 1 / (filter.r * filter.c);
  let leak = 0;
  if (st.kind === "schmitt-noninverting" || st.kind === "inverting-amplifier")
    leak = 1 / ((st.rInput + st.rFeedback) * filter.c);
  return {
    ...net,
    alpha: 0,
    gamma: net.alpha,
    state: { kappaU: w, kappaX: -w - leak, kappaO: leak, kappa0: 0, start: "steady" },
  };
}

/** The open-drain output as lowered by lib/sim/circuit (voltages numeric). */
export interface OpenDrainOutput {
  pullUp: number;
  pullUpTo: number;
  load: { r: number; to: number } | null;
}

/**
 * The pin's level with the output transistor off, by nodal analysis at the pin [derived,
 * Kirchhoff's current law]: conductances to the pull-up supply, to the load's far end and
 * through the feedback resistor to the node it returns to, each weighted by that node's
 * voltage. The feedback returns to the input u (schmitt-noninverting through rInput + rFeedback;
 * to the filter node x when there is a filter) or to the reference (schmitt-inverting through
 * rReference + rFeedback); a comparator has none.
 */
export function openDrainHigh(scenario: Scenario, out: OpenDrainOutput, filtered: boolean): HighLevel {
  const st = scenario.stage;
  const gP = 1 / out.pullUp;
  const gL = out.load ? 1 / out.load.r : 0;
  let num = gP * out.pullUpTo + (out.load ? gL * out.load.to : 0);
  let gF = 0;
  let gR = 0;
  if (st.kind === "schmitt-noninverting") gF = 1 / (st.rInput + st.rFeedback);
  else if (st.kind === "schmitt-inverting") {
    gR = 1 / (st.rReference + st.rFeedback);
    num += gR * st.reference;
  } else if (st.kind !== "comparator") throw new Error(`open-drain output on a ${st.kind}`);
  const G = gP + gL + gF + gR;
  return { h0: num / G, hU: filtered ? 0 : gF / G, hX: filtered ? gF / G : 0 };
}

/** The open-drain high level for input u and state x. */
export function highLevelAt(h: HighLevel, u: number, x: number): number {
  return h.h0 + h.hU * u + h.hX * x;
}
