"use client";
// Workbench state: one zustand store per mounted workbench (context provider), edited through
// immer. Waveforms (Float64Arrays, up to millions of samples) stay OUTSIDE immer state — immer
// would walk and freeze them (immer#1190) — in a per-mount bank; the store holds only the key.
import { createContext, useContext, useRef, type ReactNode } from "react";
import { createStore, useStore, type StoreApi } from "zustand";
import { immer } from "zustand/middleware/immer";
import { useShallow } from "zustand/react/shallow";
import type { InputComponent, Scenario } from "@/lib/schemas/scenario";
import { addRowId, fitRowIds, removeRowId, seedRowIds, swapRowIds, type RowIds } from "@/lib/workbench/row-ids";
import type { SimEvent, SimMetrics, SimResult, SolverStats } from "@/lib/sim/types";

export type RunStatus = "idle" | "running" | "done" | "error" | "cancelled" | "refused";
export type SideTab = "stage" | "signal" | "spec";

/** Where a field lives decides what it blocks: scenario fields block Run and Save, spec fields Apply, study fields study runs. */
export type FieldScope = "scenario" | "spec" | "study";

/** A field whose text does not parse or breaks its rule; the store still holds its last good value. */
export interface FieldProblem {
  label: string;
  message: string;
  inputId: string;
  scope: FieldScope;
  tab: SideTab | null;
}

export interface ResultMeta {
  rails: { high: number; low: number };
  events: SimEvent[];
  metrics: SimMetrics;
  solver: SolverStats;
  points: number;
  inputMin: number;
  inputMax: number;
  /** Scenario the result was computed from (the draft may have moved on since). */
  scenario: Scenario;
  wallMs: number;
}

export interface WorkbenchState {
  scenarioId: string;
  version: number;
  saved: Scenario;
  draft: Scenario;
  /** Name of the part profile last picked (overrides may have changed numbers since). */
  partName: string | null;
  status: RunStatus;
  progress: number;
  runError: string | null;
  resultKey: number;
  result: ResultMeta | null;
  /** Sample index under the cursor, shared by the Trace and Loop plots. */
  cursorIdx: number | null;
  tab: SideTab;
  /** `fields`: the invalid fields behind a refusal, listed as links that focus them. */
  notice: { tone: "ok" | "error"; text: string; fields?: FieldProblem[] } | null;
  /** The worker has loaded and compiled the solver (after its warm-up slice). */
  solverReady: boolean;
  /** Counts every change to the draft; dirty = revision ≠ savedRevision, stale = ≠ resultRevision. */
  revision: number;
  savedRevision: number;
  resultRevision: number;
  /** Fields that are invalid right now, by a per-field key. */
  fieldProblems: Record<string, FieldProblem>;
  /** Stable React keys of the draft's input components, one per component. */
  inputIds: RowIds;

  setFieldProblem: (key: string, problem: FieldProblem | null) => void;

  edit: (recipe: (d: Scenario) => void) => void;
  /** Input components added, removed or moved with their ids, so every other row keeps its key. */
  addInput: (c: InputComponent) => void;
  removeInput: (index: number) => void;
  moveInput: (index: number, to: number) => void;
  replaceDraft: (s: Scenario) => void;
  /**
   * The server holds `s` as `version`. `fromRevision`: the draft revision that was sent; when the
   * draft moved on while the save was under way, those later edits stay in the draft (still unsaved).
   */
  markSaved: (s: Scenario, version: number, fromRevision?: number) => void;
  setPartName: (name: string | null) => void;
  runStarted: () => void;
  runProgress: (p: number) => void;
  /** `revision`: the draft revision the run was started from. */
  runFinished: (key: number, meta: ResultMeta, revision: number) => void;
  runFailed: (status: "error" | "cancelled" | "refused", message: string | null) => void;
  setCursor: (idx: number | null) => void;
  setTab: (t: SideTab) => void;
  setNotice: (n: WorkbenchState["notice"]) => void;
  setSolverReady: (ready: boolean) => void;
}

export interface WorkbenchInit {
  scenarioId: string;
  version: number;
  scenario: Scenario;
}

export function createWorkbenchStore(init: WorkbenchInit) {
  return createStore<WorkbenchState>()(
    immer((set) => ({
      scenarioId: init.scenarioId,
      version: init.version,
      saved: init.scenario,
      draft: init.scenario,
      partName: null,
      status: "idle",
      progress: 0,
      runError: null,
      resultKey: 0,
      result: null,
      cursorIdx: null,
      tab: "stage",
      notice: null,
      solverReady: false,
      revision: 0,
      savedRevision: 0,
      resultRevision: -1,
      fieldProblems: {},
      inputIds: seedRowIds(init.scenario.input.components.length),

      setFieldProblem: (key, problem) =>
        set((s) => {
          if (problem) s.fieldProblems[key] = problem;
          else delete s.fieldProblems[key];
        }),
      edit: (recipe) =>
        set((s) => {
          recipe(s.draft as Scenario);
          s.inputIds = fitRowIds(s.inputIds, s.draft.input.components.length);
          s.revision++;
        }),
      addInput: (c) =>
        set((s) => {
          s.draft.input.components.push(c);
          s.inputIds = addRowId(s.inputIds);
          s.revision++;
        }),
      removeInput: (index) =>
        set((s) => {
          const list = s.draft.input.components;
          if (index < 0 || index >= list.length || list.length <= 1) return;
          list.splice(index, 1);
          s.inputIds = removeRowId(s.inputIds, index);
          s.revision++;
        }),
      moveInput: (index, to) =>
        set((s) => {
          const a = s.draft.input.components;
          if (to < 0 || to >= a.length || index < 0 || index >= a.length) return;
          [a[index], a[to]] = [a[to], a[index]];
          s.inputIds = swapRowIds(s.inputIds, index, to);
          s.revision++;
        }),
      replaceDraft: (sc) =>
        set((s) => {
          s.draft = sc;
          s.inputIds = fitRowIds(s.inputIds, sc.input.components.length);
          s.revision++;
        }),
      markSaved: (sc, version, fromRevision) =>
        set((s) => {
          s.saved = sc;
          s.version = version;
          if (fromRevision !== undefined && fromRevision !== s.revision) {
            s.savedRevision = fromRevision;
            return;
          }
          s.draft = sc;
          s.inputIds = fitRowIds(s.inputIds, sc.input.components.length);
          s.version = version;
          s.savedRevision = s.revision;
        }),
      setPartName: (name) =>
        set((s) => {
          s.partName = name;
        }),
      runStarted: () =>
        set((s) => {
          s.status = "running";
          s.progress = 0;
          s.runError = null;
        }),
      runProgress: (p) =>
        set((s) => {
          s.progress = p;
        }),
      runFinished: (key, meta, revision) =>
        set((s) => {
          s.resultRevision = revision;
          s.status = "done";
          s.progress = 1;
          s.resultKey = key;
          // The meta holds small arrays (events) and plain numbers only; freezing it is cheap.
          s.result = meta;
          s.cursorIdx = null;
        }),
      runFailed: (status, message) =>
        set((s) => {
          s.status = status;
          s.runError = message;
        }),
      setCursor: (idx) =>
        set((s) => {
          s.cursorIdx = idx;
        }),
      setTab: (t) =>
        set((s) => {
          s.tab = t;
        }),
      setNotice: (n) =>
        set((s) => {
          s.notice = n;
        }),
      setSolverReady: (ready) =>
        set((s) => {
          s.solverReady = ready;
        }),
    })),
  );
}

export type WorkbenchStore = ReturnType<typeof createWorkbenchStore>;

/** Waveform buffers by result key, outside the store. */
export class WaveformBank {
  private items = new Map<number, SimResult>();
  private next = 1;
  put(result: SimResult): number {
    // Keep only the latest run: old buffers can be tens of MB.
    this.items.clear();
    const key = this.next++;
    this.items.set(key, result);
    return key;
  }
  get(key: number): SimResult | undefined {
    return this.items.get(key);
  }
}

interface Ctx {
  store: WorkbenchStore;
  bank: WaveformBank;
}

const WorkbenchContext = createContext<Ctx | null>(null);

export function WorkbenchProvider({ init, children }: { init: WorkbenchInit; children: ReactNode }) {
  const ref = useRef<Ctx | null>(null);
  if (ref.current === null) ref.current = { store: createWorkbenchStore(init), bank: new WaveformBank() };
  return <WorkbenchContext.Provider value={ref.current}>{children}</WorkbenchContext.Provider>;
}

function useCtx(): Ctx {
  const c = useContext(WorkbenchContext);
  if (!c) throw new Error("Workbench components must be inside <WorkbenchProvider>");
  return c;
}

export function useWb<T>(selector: (s: WorkbenchState) => T): T {
  return useStore(useCtx().store, selector);
}

/** Object/array selectors: shallow-compared so a new object with equal fields does not re-render. */
export function useWbShallow<T extends object>(selector: (s: WorkbenchState) => T): T {
  return useStore(useCtx().store, useShallow(selector));
}

export function useWbApi(): StoreApi<WorkbenchState> {
  return useCtx().store;
}

export function useBank(): WaveformBank {
  return useCtx().bank;
}

/** The waveforms of the current result, or null. */
export function useCurrentWaveforms(): SimResult | null {
  const key = useWb((s) => s.resultKey);
  const bank = useBank();
  return key ? (bank.get(key) ?? null) : null;
}
