// The list form of a scenario: the document with pwl points and capture samples left out and
// counted. Stored beside the document (scenarios.summary, migration 0005, kept in step by the
// Scenario model's hook), so a board's list never reads waveforms; answered by
// GET /api/scenarios?boardId= (scenarioSummarySchema in ./responses). No zod here: the models
// load this at start-up.
import type { Scenario } from "./scenario";

type Component = Scenario["input"]["components"][number];
/** A list item's waveform component: pwl points and capture samples are left out and counted. */
export type LeanComponent =
  | Exclude<Component, { kind: "pwl" | "capture" }>
  | (Extract<Component, { kind: "pwl" }> & { pointCount: number })
  | (Extract<Component, { kind: "capture" }> & { pointCount: number });
export type LeanScenario = Omit<Scenario, "input"> & {
  input: Omit<Scenario["input"], "components"> & { components: LeanComponent[] };
};

export function leanScenarioOf(scenario: Scenario): LeanScenario {
  const input = scenario.input;
  const components = (input?.components ?? []).map((c): LeanComponent => {
    if (c.kind === "pwl") return { ...c, points: [], pointCount: c.points.length };
    if (c.kind === "capture") return { ...c, samples: [], pointCount: c.samples.length };
    return c;
  });
  return { ...scenario, input: { ...input, components } };
}
