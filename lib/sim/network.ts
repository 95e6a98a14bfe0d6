// Stage topologies (DESIGN.md "Stage topologies"): the op-amp's differential input
// vd = v+ − v− + Vos is linear in the input u, the output vo and the timing-capacitor voltage vc:
//   vd = alpha·u + beta·vo + gamma·vc + delta
// The coefficients are written once per run; the solvers never look at the stage kind again.
import type { Scenario } from "@/lib/schemas/scenario";

export interface Network {
  alpha: number;
  beta: number;
  gamma: number;
  delta: number;
  /** Timing constant rTiming·cTiming of the capacitor node (relaxation oscillator), else 0. */
  tauC: number;
  /** The input reaches v− (an upward input crossing gives a falling output edge). */
  inverting: boolean;
  /** Amplifier stages (negative feedback): no propagation-delay reading. */
  amplifier: boolean;
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
      return { alpha: 1, beta: -g, gamma: 0, delta: -ref * (1 - g) + vos, tauC: 0, inverting: false, amplifier: true };
    }
    case "inverting-amplifier": {
      // v+ = ref; v− = (u·rF + vo·rI)/(rI + rF)
      const s = st.rInput + st.rFeedback;
      return { alpha: -st.rFeedback / s, beta: -st.rInput / s, gamma: 0, delta: ref + vos, tauC: 0, inverting: true, amplifier: true };
    }
    case "comparator":
      return st.inputAt === "inverting"
        ? { alpha: -1, beta: 0, gamma: 0, delta: ref + vos, tauC: 0, inverting: true, amplifier: false }
        : { alpha: 1, beta: 0, gamma: 0, delta: -ref + vos, tauC: 0, inverting: false, amplifier: false };
    case "schmitt-noninverting": {
      // v+ = (u·rF + vo·rI)/(rI + rF); v− = ref
      const s = st.rInput + st.rFeedback;
      return { alpha: st.rFeedback / s, beta: st.rInput / s, gamma: 0, delta: -ref + vos, tauC: 0, inverting: false, amplifier: false };
    }
    case "schmitt-inverting": {
      // v+ = (ref·rF + vo·rR)/(rR + rF); v− = u
      const s = st.rReference + st.rFeedback;
      return { alpha: -1, beta: st.rReference / s, gamma: 0, delta: (ref * st.rFeedback) / s + vos, tauC: 0, inverting: true, amplifier: false };
    }
    case "relaxation-oscillator": {
      // As schmitt-inverting, but v− is the capacitor node (rTiming from vo, cTiming to 0 V);
      // the input signal is not connected to the stage.
      const s = st.rReference + st.rFeedback;
      return {
        alpha: 0,
        beta: st.rReference / s,
        gamma: -1,
        delta: (ref * st.rFeedback) / s + vos,
        tauC: st.rTiming * st.cTiming,
        inverting: true,
        amplifier: false,
      };
    }
  }
}
