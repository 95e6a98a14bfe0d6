// Worst-case corners for the tolerance spread, from lib/design/spread's corner search, in the same
// figures (and units) the Monte Carlo measures by simulation.
import type { Scenario } from "@/lib/schemas/scenario";
import { circuitWorstCase } from "@/lib/design/spread";
import type { ToleranceSpreadConfig } from "@/lib/schemas/study";
import { studyScenario, studySpreadOptions, type Corners } from "./tolerance-spread";

/** The corners of the same model the draws sample (lib/design/spread): every part, the supply and the NTC. */
export function studyCorners(scenario: Scenario, config: ToleranceSpreadConfig | undefined): Corners {
  if (!config) return {};
  let wc;
  try {
    wc = circuitWorstCase(studyScenario(scenario, config), { ...studySpreadOptions(config), everyPart: false });
  } catch {
    return {}; // a stage the closed forms cannot bound: the histogram is shown without corners
  }
  const out: Corners = {};
  if (wc.upperThreshold) out.upperThreshold = wc.upperThreshold;
  if (wc.lowerThreshold) out.lowerThreshold = wc.lowerThreshold;
  if (wc.gain) out.gain = wc.gain;
  if (wc.frequency && wc.frequency[0] > 0) out.period = [1 / wc.frequency[1], 1 / wc.frequency[0]];
  return out;
}
