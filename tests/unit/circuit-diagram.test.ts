// The generated diagram and the parts list table show the circuit as built: the reference
// divider's two resistors, the source, the filter and the pull-up (rendered to static markup).
import { describe, expect, it } from "vitest";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { StageDiagram } from "@/components/workbench/stage-diagram";
import { PartsList } from "@/components/circuit/parts-list";
import { DEMO_SCENARIOS } from "@/lib/demo/scenarios";
import { parseScenario } from "@/lib/schemas/scenario";

const water = parseScenario(DEMO_SCENARIOS.find((s) => s.key === "water-temperature-alarm")!.scenario);

describe("StageDiagram as built", () => {
  it("draws the reference divider instead of a reference resistor, and names the source", () => {
    const html = renderToStaticMarkup(createElement(StageDiagram, { scenario: water }));
    expect(html).toContain('data-role="rTop"');
    expect(html).toContain('data-role="rBottom"');
    expect(html).not.toContain('data-role="rReference"');
    expect(html).toMatch(/water temperature NTC 10 kΩ at the bottom of a divider with 15 kΩ/);
  });

  it("lists a filter and an open-drain output under the network", () => {
    const s = { ...water, filter: { r: 10e3, c: 1e-6 }, output: { kind: "open-drain" as const, pullUp: 10e3 } };
    const html = renderToStaticMarkup(createElement(StageDiagram, { scenario: s }));
    expect(html).toMatch(/RC filter before the input: 10 kΩ in series, 1 µF to 0 V/);
    expect(html).toMatch(/out: open drain, 10 kΩ pull-up to the positive supply/);
  });
});

describe("PartsList", () => {
  it("renders one row per part with its RKM code (IEC 60062) and a CSV link", () => {
    const html = renderToStaticMarkup(createElement(PartsList, { scenario: water }));
    for (const ref of ["TH1", "R1", "R2", "R3", "R4"]) expect(html).toContain(`data-part="${ref}"`);
    expect(html).toContain("7K5");
    expect(html).toContain('data-testid="parts-csv"');
    expect(html).not.toContain('data-testid="parts-warnings"');
  });
});
