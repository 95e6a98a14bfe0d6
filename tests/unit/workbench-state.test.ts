// Workbench state without a browser: stable row ids of the input list, the dirty mark from the
// revision counter (not from comparing drafts), a save that lands while the user kept typing,
// and the studies card's reducer. The expected values follow from the actions themselves
// (common practice, no source).
import { describe, expect, it } from "vitest";
import { addRowId, contentKeys, fitRowIds, removeRowId, seedRowIds, swapRowIds } from "@/lib/workbench/row-ids";
import {
  initialStudiesState,
  studiesReducer,
  studiesStale,
  studySaveBlocked,
  type NoiseDone,
} from "@/lib/workbench/studies-state";
import { createWorkbenchStore } from "@/components/workbench/store";
import { scenario } from "./sim-fixtures";

describe("row ids", () => {
  it("keep each row's id when a middle row goes or rows swap", () => {
    let r = seedRowIds(3);
    expect(r.ids).toEqual([1, 2, 3]);
    r = addRowId(r);
    expect(r.ids).toEqual([1, 2, 3, 4]);
    r = removeRowId(r, 1);
    expect(r.ids).toEqual([1, 3, 4]);
    r = swapRowIds(r, 2, 1);
    expect(r.ids).toEqual([1, 4, 3]);
    // A new row never reuses an id that was handed out before.
    expect(addRowId(r).ids).toEqual([1, 4, 3, 5]);
    // Out-of-range moves change nothing.
    expect(swapRowIds(r, 0, -1)).toBe(r);
    expect(swapRowIds(r, 2, 3)).toBe(r);
  });

  it("fit a list that changed length elsewhere: appended rows get new ids, a shorter list all new", () => {
    const r = seedRowIds(2);
    expect(fitRowIds(r, 2)).toBe(r);
    expect(fitRowIds(r, 4).ids).toEqual([1, 2, 3, 4]);
    const shorter = fitRowIds(r, 1);
    expect(shorter.ids).toEqual([3]);
    expect(shorter.next).toBe(4);
  });

  it("content keys are the text, with #2, #3 on repeats", () => {
    expect(contentKeys(["time", "volts", "volts", "volts"])).toEqual(["time", "volts", "volts#2", "volts#3"]);
    expect(contentKeys([{ t: "a" }, { t: "a" }], (x) => x.t)).toEqual(["a", "a#2"]);
    expect(new Set(contentKeys(["", "", ""])).size).toBe(3);
  });
});

function store() {
  const sc = scenario({
    input: {
      components: [
        { kind: "dc", level: 1 },
        { kind: "dc", level: 2 },
        { kind: "dc", level: 3 },
      ],
    },
  });
  return createWorkbenchStore({ scenarioId: "s1", version: 1, scenario: sc });
}

const dirty = (s: ReturnType<typeof store>) => s.getState().revision !== s.getState().savedRevision;
const levels = (s: ReturnType<typeof store>) =>
  s.getState().draft.input.components.map((c) => (c.kind === "dc" ? c.level : null));

describe("workbench store", () => {
  it("removes and moves input components together with their ids", () => {
    const s = store();
    expect(s.getState().inputIds.ids).toEqual([1, 2, 3]);
    s.getState().removeInput(1);
    expect(levels(s)).toEqual([1, 3]);
    expect(s.getState().inputIds.ids).toEqual([1, 3]);
    s.getState().moveInput(1, 0);
    expect(levels(s)).toEqual([3, 1]);
    expect(s.getState().inputIds.ids).toEqual([3, 1]);
    s.getState().addInput({ kind: "dc", level: 4 });
    expect(s.getState().inputIds.ids).toEqual([3, 1, 4]);
    // An edit that appends by itself (a design applied) still gets an id for the new row.
    s.getState().edit((d) => void d.input.components.push({ kind: "dc", level: 5 }));
    expect(s.getState().inputIds.ids).toEqual([3, 1, 4, 5]);
  });

  it("never removes the last component", () => {
    const s = store();
    s.getState().removeInput(0);
    s.getState().removeInput(0);
    s.getState().removeInput(0);
    expect(levels(s)).toEqual([3]);
  });

  it("is dirty after any edit, even one that puts the old value back, and clean after a save", () => {
    const s = store();
    expect(dirty(s)).toBe(false);
    s.getState().edit((d) => void (d.supply.positive = 6));
    expect(dirty(s)).toBe(true);
    s.getState().edit((d) => void (d.supply.positive = 5));
    // The revision counts edits; nothing stringifies the draft to compare.
    expect(dirty(s)).toBe(true);
    const rev = s.getState().revision;
    s.getState().markSaved(s.getState().draft, 2, rev);
    expect(dirty(s)).toBe(false);
    expect(s.getState().version).toBe(2);
    s.getState().edit((d) => void (d.supply.positive = 7));
    expect(dirty(s)).toBe(true);
  });

  it("keeps edits typed while a save was under way, still marked unsaved", () => {
    const s = store();
    s.getState().edit((d) => void (d.supply.positive = 6));
    const sent = s.getState().revision;
    const snapshot = structuredClone(s.getState().draft);
    // The user types on while the request is out.
    s.getState().edit((d) => void (d.supply.positive = 9));
    s.getState().markSaved(snapshot, 2, sent);
    expect(s.getState().draft.supply.positive).toBe(9);
    expect(s.getState().saved.supply.positive).toBe(6);
    expect(s.getState().version).toBe(2);
    expect(dirty(s)).toBe(true);
  });
});

const noiseDone = (on: number) => ({ on }) as unknown as NoiseDone;

describe("studies card reducer", () => {
  it("clears the old error and saved note when a study starts, and the running mark when it stops", () => {
    let st = studiesReducer(initialStudiesState, { type: "failed", message: "Study failed — x" });
    st = studiesReducer(st, { type: "saved", runId: "r1" });
    st = studiesReducer(st, { type: "started", which: "tolerance" });
    expect(st).toMatchObject({ running: "tolerance", error: null, saved: null });
    st = studiesReducer(st, { type: "stopped" });
    expect(st.running).toBeNull();
  });

  it("says why Save with a new run is not pressable", () => {
    expect(studySaveBlocked(initialStudiesState, 0, null)).toMatch(/Run a study first/);
    let st = studiesReducer(initialStudiesState, { type: "noiseDone", done: noiseDone(4) });
    expect(studySaveBlocked(st, 4, null)).toBeNull();
    expect(studySaveBlocked(st, 4, "Save the scenario first.")).toBe("Save the scenario first.");
    expect(studiesStale(st, 5)).toBe(true);
    expect(studySaveBlocked(st, 5, null)).toMatch(/scenario changed/);
    st = studiesReducer(st, { type: "started", which: "noise" });
    expect(studySaveBlocked(st, 4, null)).toMatch(/running study/);
  });

  it("keeps the saving flag until the save ends either way", () => {
    let st = studiesReducer(initialStudiesState, { type: "saveStarted" });
    expect(st.saving).toBe(true);
    st = studiesReducer(st, { type: "saveFailed", message: "Not saved — 403" });
    expect(st).toMatchObject({ saving: false, error: "Not saved — 403" });
  });
});
