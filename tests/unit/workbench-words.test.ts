// Messages in the words of the screen: real zod issues of the scenario and study contracts come
// out with the labels the Workbench shows, never a code field name. The expected labels are the
// ones on the Stage, Signal and Studies panels (common practice, no source).
import { describe, expect, it } from "vitest";
import { noiseMarginConfigSchema, toleranceSpreadConfigSchema } from "@/lib/schemas/study";
import { scenarioSchema } from "@/lib/schemas/scenario";
import { apiIssuesText, inScreenWords, scenarioIssuesText, scenarioLabel } from "@/lib/workbench/screen-words";
import { studyIssueText, studyRule } from "@/lib/workbench/study-suggest";
import { scenario } from "./sim-fixtures";

/** A camelCase word or a dotted path: what a code field name looks like. */
const CODE_NAME = /\b[a-z]+[A-Z]\w*\b|\b[a-z]+\.[a-z]+\b/;

describe("scenario issues", () => {
  it("label paths as the panels do", () => {
    expect(scenarioLabel(["supply", "positive"])).toBe("V+");
    expect(scenarioLabel(["opamp", "outputHeadroomHigh"])).toBe("Headroom V+");
    expect(scenarioLabel(["stage", "rReference"])).toBe("R reference");
    expect(scenarioLabel(["input", "components", 1, "amplitude"])).toBe("Component 2 Amplitude (peak)");
    expect(scenarioLabel(["run", "points"])).toBe("Output points");
    expect(scenarioLabel(["nothing", "here"])).toBeNull();
  });

  it("write a cross-field rule of the contract with the fields' labels", () => {
    const good = scenario({});
    const bad = { ...good, opamp: { ...good.opamp, outputHeadroomHigh: 6, outputHeadroomLow: 6 } };
    const r = scenarioSchema.safeParse(bad);
    expect(r.success).toBe(false);
    const text = scenarioIssuesText(r.error!.issues);
    expect(text).toMatch(/^“Headroom V\+” \+ “Headroom V−” \(12 V\) must be smaller than the supply span \(10 V\)/);
    expect(text).not.toMatch(CODE_NAME);
  });

  it("name a reference outside the supplies by its label", () => {
    const good = scenario({});
    const r = scenarioSchema.safeParse({ ...good, stage: { ...good.stage, reference: 7 } });
    expect(r.success).toBe(false);
    const text = scenarioIssuesText(r.error!.issues);
    expect(text).toMatch(/“Reference” \(7 V\) must lie within the supplies/);
    expect(text).not.toMatch(CODE_NAME);
  });

  it("leave plain words alone and turn stage kinds into their names", () => {
    expect(inScreenWords("the reference and the duration")).toBe("the reference and the duration");
    expect(inScreenWords("target.k does not apply to relaxation-oscillator")).toMatch(/relaxation oscillator$/);
  });

  it("read a server's 400 body (paths under scenario) the same way", () => {
    const text = apiIssuesText({
      error: "invalid_input",
      message: "Invalid request body",
      issues: [{ path: ["scenario", "stage", "rFeedback"], message: "stage.rFeedback must be greater than 0" }],
    });
    expect(text).toBe("Invalid request body: “R feedback” must be greater than 0");
    expect(apiIssuesText({ message: "Not found" })).toBeNull();
  });
});

describe("study issues", () => {
  const noise = {
    kind: "noise-margin",
    seed: 1,
    rmsFrom: 0.01,
    rmsTo: 0.1,
    levels: 20,
    seedsPerLevel: 50,
    bandwidth: 1000,
    limit: 0.01,
  };

  it("say the form's labels for count, order and percent rules", () => {
    for (const [patch, want] of [
      [{ seedsPerLevel: 20_000 }, /^“seeds per level” must be at most 10000/],
      [{ rmsTo: 0.001 }, /^“rms to” must be above “rms from”/],
      [{ limit: 1.5 }, /^“chatter limit” must be above 0 % and below 100 %$/],
    ] as const) {
      const r = noiseMarginConfigSchema.safeParse({ ...noise, ...patch });
      expect(r.success).toBe(false);
      const text = studyIssueText(r.error!.issues);
      expect(text).toMatch(want);
      expect(text).not.toMatch(CODE_NAME);
    }
  });

  it("name a spec window by its two fields", () => {
    const r = toleranceSpreadConfigSchema.safeParse({
      kind: "tolerance-spread",
      seed: 1,
      draws: 100,
      resistorTolerance: 0.01,
      offsetTolerance: 0.001,
      headroomSpread: 0.2,
      distribution: "uniform",
      probe: { kind: "scenario" },
      measures: ["upperThreshold"],
      window: { upperThreshold: [2, 1] },
    });
    expect(r.success).toBe(false);
    const text = studyIssueText(r.error!.issues);
    expect(text).toBe("“Upper threshold max” must be above “Upper threshold min”");
  });

  it("check fields in the units they are typed in", () => {
    expect(studyRule("limit", 1)).toBeNull(); // 1 % in the form is 0.01 in the config
    expect(studyRule("limit", 100)).toMatch(/below 100 %/);
    expect(studyRule("resistorTolerance", 60)).toMatch(/50 %/);
    expect(studyRule("seedsPerLevel", 20_000)).toMatch(/10,000/);
    expect(studyRule("seedsPerLevel", 2.5)).toMatch(/whole number/);
  });
});
