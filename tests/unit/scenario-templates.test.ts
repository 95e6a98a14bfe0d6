import { describe, expect, it } from "vitest";
import { blankScenario } from "@/lib/client/scenario-templates";
import { STAGE_KINDS, scenarioSchema } from "@/lib/schemas/scenario";
import { suggestsLoadSwitching } from "@/components/safety-caution";

describe("blank scenario templates", () => {
  it.each(STAGE_KINDS)("the %s template is a valid railwise.scenario/1 document of that kind", (kind) => {
    const r = scenarioSchema.safeParse(blankScenario(kind, `New ${kind}`));
    expect(r.success, r.success ? "" : JSON.stringify(r.error.issues)).toBe(true);
    if (r.success) {
      expect(r.data.stage.kind).toBe(kind);
      expect(r.data.name).toBe(`New ${kind}`);
    }
  });

  it("returns a fresh object each time (editing one must not change the next)", () => {
    const a = blankScenario("comparator");
    a.opamp.gainBandwidth = 1;
    expect(blankScenario("comparator").opamp.gainBandwidth).toBe(1e6);
  });
});

describe("safety caution trigger", () => {
  it("fires on load words in names and notes", () => {
    expect(suggestsLoadSwitching("Battery low-voltage disconnect")).toBe(true);
    expect(suggestsLoadSwitching("Bilge float bounce filter")).toBe(true);
    expect(suggestsLoadSwitching(null, "drives the heater relay")).toBe(true);
    expect(suggestsLoadSwitching("Fan control from NTC")).toBe(true);
  });
  it("stays quiet on signal-only stages and partial words", () => {
    expect(suggestsLoadSwitching("Hydrophone preamp")).toBe(false);
    expect(suggestsLoadSwitching("Fantastic filter", "famous pumpkin")).toBe(false);
    expect(suggestsLoadSwitching(undefined, "")).toBe(false);
  });
});
