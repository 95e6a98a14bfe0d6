// Worst-case corners for the tolerance spread, from lib/design's closed forms, in the same
// figures (and units) the Monte Carlo measures by simulation.
import type { Scenario } from "@/lib/schemas/scenario";
import { worstCase } from "@/lib/design";
import type { ToleranceSpreadConfig } from "./schema";
import type { Corners } from "./tolerance-spread";

export function studyCorners(scenario: Scenario, config: ToleranceSpreadConfig | undefined): Corners {
  if (!config) return {};
  let wc;
  try {
    wc = worstCase(scenario.stage, scenario.opamp, scenario.supply, config.resistorTolerance, {
      offset: config.offsetTolerance,
      headroomSpread: config.headroomSpread,
      capacitorTolerance: config.capacitorTolerance ?? config.resistorTolerance,
    });
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
