// Plain-English names for stage kinds and resistor roles, shared by tables, forms and the board list.
import type { StageKind } from "@/lib/schemas/scenario";

export const STAGE_KIND_LABEL: Record<StageKind, string> = {
  "noninverting-amplifier": "Non-inverting amplifier",
  "inverting-amplifier": "Inverting amplifier",
  comparator: "Comparator",
  "schmitt-noninverting": "Schmitt trigger, non-inverting",
  "schmitt-inverting": "Schmitt trigger, inverting",
  "relaxation-oscillator": "Relaxation oscillator",
};

/** Short form for narrow table cells. */
export const STAGE_KIND_SHORT: Record<StageKind, string> = {
  "noninverting-amplifier": "Amp, non-inv.",
  "inverting-amplifier": "Amp, inverting",
  comparator: "Comparator",
  "schmitt-noninverting": "Schmitt, non-inv.",
  "schmitt-inverting": "Schmitt, inverting",
  "relaxation-oscillator": "Oscillator",
};

export type StageRole = "rInput" | "rFeedback" | "rGround" | "rReference" | "rTiming" | "cTiming";

/** Where each part sits in the network (DESIGN.md, stage topologies). */
export const STAGE_ROLE_LABEL: Record<StageRole, { name: string; between: string }> = {
  rInput: { name: "R input", between: "input → summing pin" },
  rFeedback: { name: "R feedback", between: "output → summing pin" },
  rGround: { name: "R ground", between: "v− → reference" },
  rReference: { name: "R reference", between: "reference → v+" },
  rTiming: { name: "R timing", between: "output → v− (capacitor node)" },
  cTiming: { name: "C timing", between: "v− → 0 V" },
};

export const STAGE_ROLE_ORDER: StageRole[] = ["rInput", "rGround", "rReference", "rFeedback", "rTiming", "cTiming"];
