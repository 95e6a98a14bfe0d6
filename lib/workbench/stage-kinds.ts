// Stage kinds as the workbench presents them: our labels, the resistor roles each kind uses,
// and the values a fresh stage of that kind starts with.
import type { Stage, StageKind } from "@/lib/schemas/scenario";

export type ResistorRole = "rInput" | "rFeedback" | "rGround" | "rReference" | "rTiming";

export interface KindInfo {
  /** One line on what the stage does, shown under the kind picker. */
  blurb: string;
  roles: ResistorRole[];
  capacitor: boolean;
  /** True when the output is meant to sit at a limit (switching stages). */
  switching: boolean;
}

export const KIND_INFO: Record<StageKind, KindInfo> = {
  "noninverting-amplifier": {
    blurb: "Input on v+, feedback divider to the reference. Gain 1 + R feedback / R ground.",
    roles: ["rGround", "rFeedback"],
    capacitor: false,
    switching: false,
  },
  "inverting-amplifier": {
    blurb: "Input through R input to v−, v+ at the reference. Gain −R feedback / R input.",
    roles: ["rInput", "rFeedback"],
    capacitor: false,
    switching: false,
  },
  comparator: {
    blurb: "Open loop: the output swings to a limit as soon as the input crosses the reference.",
    roles: [],
    capacitor: false,
    switching: true,
  },
  "schmitt-noninverting": {
    blurb: "Input through R input to v+, positive feedback through R feedback; v− at the reference.",
    roles: ["rInput", "rFeedback"],
    capacitor: false,
    switching: true,
  },
  "schmitt-inverting": {
    blurb: "Input on v−; v+ set by R reference from the reference and R feedback from the output.",
    roles: ["rReference", "rFeedback"],
    capacitor: false,
    switching: true,
  },
  "relaxation-oscillator": {
    blurb: "An inverting hysteresis trigger whose v− is a capacitor charged from the output through R timing.",
    roles: ["rReference", "rFeedback", "rTiming"],
    capacitor: true,
    switching: true,
  },
};

const DEFAULT_OHMS: Record<ResistorRole, number> = {
  rInput: 10e3,
  rFeedback: 100e3,
  rGround: 10e3,
  rReference: 100e3,
  rTiming: 100e3,
};

type AnyStage = Partial<Record<ResistorRole, number>> & { reference?: number; cTiming?: number; inputAt?: string };

/** The stage re-shaped for another kind, keeping every value the two kinds share. */
export function switchStageKind(stage: Stage, kind: StageKind): Stage {
  const old = stage as AnyStage;
  const reference = old.reference ?? 0;
  if (kind === "comparator") {
    return { kind, reference, inputAt: old.inputAt === "inverting" ? "inverting" : "noninverting" };
  }
  const next: AnyStage & { kind: StageKind } = { kind, reference };
  for (const role of KIND_INFO[kind].roles) next[role] = old[role] ?? DEFAULT_OHMS[role];
  if (KIND_INFO[kind].capacitor) next.cTiming = old.cTiming ?? 1e-6;
  return next as Stage;
}

export function stageRoles(stage: Stage): ResistorRole[] {
  return KIND_INFO[stage.kind].roles;
}

export function roleValue(stage: Stage, role: ResistorRole): number | undefined {
  return (stage as AnyStage)[role];
}
