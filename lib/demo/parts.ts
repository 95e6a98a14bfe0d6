// Generic demo part profiles (behavioural op-amp parameters, SI units). Plausible values for
// the class of part each name describes — common practice, no source; no real part numbers.
import type { OpAmp } from "@/lib/schemas/scenario";

export interface DemoPartProfile {
  name: string;
  params: OpAmp;
}

export const GENERAL_PURPOSE_BIPOLAR: OpAmp = {
  openLoopGain: 2e5,
  gainBandwidth: 1e6,
  slewRate: 0.5e6, // 0.5 V/µs
  outputHeadroomHigh: 1.5,
  outputHeadroomLow: 1.5,
  inputOffset: 1e-3,
};

export const RAIL_TO_RAIL_CMOS_1MHZ: OpAmp = {
  openLoopGain: 1e5,
  gainBandwidth: 1e6,
  slewRate: 0.6e6, // 0.6 V/µs
  outputHeadroomHigh: 0.02,
  outputHeadroomLow: 0.02,
  inputOffset: 0.5e-3,
};

export const FAST_COMPARATOR_STYLE: OpAmp = {
  openLoopGain: 2e5,
  gainBandwidth: 10e6,
  slewRate: 20e6, // 20 V/µs
  outputHeadroomHigh: 0.1,
  outputHeadroomLow: 0.1,
  inputOffset: 2e-3,
  propagationDelay: 200e-9,
};

export const DEMO_PART_PROFILES: DemoPartProfile[] = [
  { name: "general-purpose bipolar", params: GENERAL_PURPOSE_BIPOLAR },
  { name: "rail-to-rail CMOS 1 MHz", params: RAIL_TO_RAIL_CMOS_1MHZ },
  { name: "fast comparator-style 20 V/µs", params: FAST_COMPARATOR_STYLE },
];
