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

/** Where each part sits in the network (lib/schemas/README.md § Stage topologies). */
export const STAGE_ROLE_LABEL: Record<StageRole, { name: string; between: string }> = {
  rInput: { name: "R input", between: "input → summing pin" },
  rFeedback: { name: "R feedback", between: "output → summing pin" },
  rGround: { name: "R ground", between: "v− → reference" },
  rReference: { name: "R reference", between: "reference → v+" },
  rTiming: { name: "R timing", between: "output → v− (capacitor node)" },
  cTiming: { name: "C timing", between: "v− → 0 V" },
};

export const STAGE_ROLE_ORDER: StageRole[] = ["rInput", "rGround", "rReference", "rFeedback", "rTiming", "cTiming"];

/** Exact position of a part in a given stage kind (lib/schemas/README.md § Stage topologies), e.g. rFeedback of a Schmitt trigger: "output → v+". */
export function roleWhere(kind: StageKind, role: StageRole): string {
  const toPlus = kind === "schmitt-noninverting" || kind === "schmitt-inverting" || kind === "relaxation-oscillator";
  switch (role) {
    case "rFeedback":
      return toPlus ? "output → v+" : "output → v−";
    case "rInput":
      return toPlus ? "input → v+" : "input → v−";
    default:
      return STAGE_ROLE_LABEL[role].between;
  }
}

/** Where the input signal enters the stage, in words. */
export function inputWhere(kind: StageKind, inputAt?: "noninverting" | "inverting"): string {
  switch (kind) {
    case "noninverting-amplifier":
      return "v+ directly";
    case "inverting-amplifier":
      return "v− through R input";
    case "comparator":
      return inputAt === "inverting" ? "v− directly; reference on v+" : "v+ directly; reference on v−";
    case "schmitt-noninverting":
      return "v+ through R input; reference on v−";
    case "schmitt-inverting":
      return "v− directly";
    case "relaxation-oscillator":
      return "none: the stage runs by itself";
  }
}
