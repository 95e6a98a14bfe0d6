// State of the Workbench's studies card as one reducer: which study tab shows, the last finished
// noise margin study and tolerance spread, the study running now, the last error and the save
// under way or done. Pure, no React (the card calls it through useReducer).
import type { NoiseMarginSummary, NoiseTaskOutput } from "@/lib/studies/noise-margin";
import type { DrawOutput, NoiseMarginConfig, ToleranceSpreadConfig } from "@/lib/schemas/study";
import type { ToleranceSpreadSummary } from "@/lib/studies/tolerance-spread";

export type StudyTab = "noise" | "tolerance";

export interface StudyDone<C, T, S> {
  /** Revision of the scenario the study ran on, to tell when the editor has moved on. */
  on: number;
  config: C;
  tasks: T[];
  summary: S;
  wallMs: number;
  workers: number;
}
export type NoiseDone = StudyDone<NoiseMarginConfig, NoiseTaskOutput, NoiseMarginSummary>;
export type ToleranceDone = StudyDone<ToleranceSpreadConfig, DrawOutput, ToleranceSpreadSummary>;

export interface StudiesState {
  tab: StudyTab;
  noise: NoiseDone | null;
  tolerance: ToleranceDone | null;
  running: StudyTab | null;
  error: string | null;
  saved: { runId: string } | null;
  saving: boolean;
}

export type StudiesAction =
  | { type: "tab"; tab: StudyTab }
  | { type: "started"; which: StudyTab }
  | { type: "noiseDone"; done: NoiseDone }
  | { type: "toleranceDone"; done: ToleranceDone }
  | { type: "failed"; message: string }
  | { type: "stopped" }
  | { type: "saveStarted" }
  | { type: "saved"; runId: string }
  | { type: "saveFailed"; message: string };

export const initialStudiesState: StudiesState = {
  tab: "noise",
  noise: null,
  tolerance: null,
  running: null,
  error: null,
  saved: null,
  saving: false,
};

export function studiesReducer(state: StudiesState, action: StudiesAction): StudiesState {
  switch (action.type) {
    case "tab":
      return { ...state, tab: action.tab };
    case "started":
      // A new study: the old error and the "saved" note no longer describe what is on screen.
      return { ...state, running: action.which, error: null, saved: null };
    case "noiseDone":
      return { ...state, noise: action.done };
    case "toleranceDone":
      return { ...state, tolerance: action.done };
    case "failed":
      return { ...state, error: action.message };
    case "stopped":
      return { ...state, running: null };
    case "saveStarted":
      return { ...state, saving: true, error: null };
    case "saved":
      return { ...state, saving: false, saved: { runId: action.runId } };
    case "saveFailed":
      return { ...state, saving: false, error: action.message };
  }
}

/** A finished study no longer matches the scenario once the editor's revision moved past it. */
export function studiesStale(state: StudiesState, revision: number): boolean {
  return (!!state.noise && state.noise.on !== revision) || (!!state.tolerance && state.tolerance.on !== revision);
}

/** Why "Save with a new run" is not pressable now, in the card's words; null when it is. */
export function studySaveBlocked(state: StudiesState, revision: number, saveBlocked: string | null): string | null {
  if (!(state.noise || state.tolerance)) return "Run a study first; then save it with a new run.";
  if (state.running) return "Wait for the running study to finish.";
  if (studiesStale(state, revision)) return "The scenario changed since these studies ran: run them again.";
  return saveBlocked;
}
