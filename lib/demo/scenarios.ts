// The demo board "Buoy power and sensing" of Fjordline Aquaculture (DEVELOPERS.md § Demo data, invented).
// Pure data + lib/schemas only: the seed, the tests and the UI import it.
// Resistor values are E24 and come from the closed forms in tests/REFERENCES.md (Schmitt trigger,
// relaxation oscillator, NTC Beta model); each comment says what the chosen values give.
import { SCENARIO_SCHEMA_ID, type ScenarioInput } from "@/lib/schemas/scenario";
import { FAST_COMPARATOR_STYLE, GENERAL_PURPOSE_BIPOLAR, RAIL_TO_RAIL_CMOS_1MHZ } from "./parts";

export const DEMO_BOARD = {
  name: "Buoy power and sensing",
  description:
    "Fish-pen monitoring buoy: battery protection, hydrophone front end, water temperature, bilge and status lamp.",
};

export const HARROW_BOARD = {
  name: "Mooring light panel",
  description: "Dusk switch for the mooring light.",
};

/** Small deterministic generator (mulberry32) so the demo data is identical on every seed. */
function mulberry32(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function gaussian(next: () => number) {
  // Box–Muller; 1 − u keeps the logarithm finite.
  const u = 1 - next();
  const v = next();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

const round = (x: number, digits = 6) => Number(x.toFixed(digits));

// ---------------------------------------------------------------------------------------------
// 1. Battery low-voltage disconnect. 12 V lead-acid → divider 68 kΩ / 18 kΩ (k = 18/86 =
// 0.20930) → v− of an inverting Schmitt trigger on a single 5 V supply, rail-to-rail CMOS
// (Voh 4.98 V, Vol 0.02 V), 2.5 V shunt reference through rReference 33 kΩ, rFeedback 680 kΩ.
// Inverting-trigger closed form (tests/REFERENCES.md): upper = (Vref·rFb + Voh·rRef)/(rRef + rFb)
// = 2.6148 V at the divider (battery 12.493 V, target 12.5 V reconnect); lower = (Vref·rFb +
// Vol·rRef)/(rRef + rFb) = 2.3852 V (battery 11.396 V, target 11.4 V cut). Output high = cut.
export const BATTERY_DIVIDER = { top: 68e3, bottom: 18e3 } as const;
const batteryK = BATTERY_DIVIDER.bottom / (BATTERY_DIVIDER.top + BATTERY_DIVIDER.bottom);
/** Battery volts → volts at the stage input. */
export const batteryToInput = (vBattery: number) => round(vBattery * batteryK);

const batteryCutoff: ScenarioInput = {
  schema: SCENARIO_SCHEMA_ID,
  name: "Battery low-voltage disconnect",
  supply: { positive: 5, negative: 0 },
  opamp: RAIL_TO_RAIL_CMOS_1MHZ,
  stage: { kind: "schmitt-inverting", rReference: 33e3, rFeedback: 680e3, reference: 2.5 },
  // The battery reaches v− through the 68 k / 18 k divider (a high-impedance input: unloaded).
  source: {
    quantity: "battery",
    unit: "V",
    sensor: { kind: "divider", rTop: BATTERY_DIVIDER.top, rBottom: BATTERY_DIVIDER.bottom },
  },
  input: {
    // A discharge from 13.0 V to 11.0 V over 60 s and a recharge back, in battery volts.
    components: [
      {
        kind: "pwl",
        points: [
          [0, 13.0],
          [60, 11.0],
          [120, 13.0],
        ],
      },
    ],
    // Load ripple at the divider, far inside the 0.23 V deadband.
    noise: { rms: 0.004, bandwidth: 50, seed: 11 },
  },
  run: { duration: 120, points: 6000, initialOutput: "low" },
  tolerances: { resistor: 0.01 },
  spec: {
    schema: "railwise.design-spec/1",
    name: "Battery cut at 11.4 V, reconnect at 12.5 V",
    kind: "schmitt-inverting",
    supply: { positive: 5, negative: 0 },
    opamp: RAIL_TO_RAIL_CMOS_1MHZ,
    target: { upperThreshold: 12.5, lowerThreshold: 11.4 },
    series: "E24",
    tolerance: 0.01,
    reference: 2.5,
    sensor: { kind: "divider", rTop: BATTERY_DIVIDER.top, rBottom: BATTERY_DIVIDER.bottom },
  },
};

// ---------------------------------------------------------------------------------------------
// 2. Hydrophone preamp. Non-inverting gain stage, rGround 2.2 kΩ, rFeedback 47 kΩ: gain
// 1 + 47/2.2 = 22.36 (closed-loop bandwidth ≈ 1 MHz / 22.36 = 44.7 kHz). Dual ±5 V,
// general-purpose bipolar (limits ±3.5 V). A 20 mV tone gives 0.45 V; a loud 0.25 V burst asks
// for 5.6 V and clips at the limits.
function burstPoints(): [number, number][] {
  const f = 1000; // Hz
  const start = 4e-3;
  const length = 6e-3;
  const amplitude = 0.25;
  const perCycle = 24;
  const points: [number, number][] = [
    [0, 0],
    [start, 0],
  ];
  const n = Math.round(length * f * perCycle);
  for (let i = 1; i <= n; i++) {
    const t = (i / n) * length;
    // Raised-cosine envelope: the burst swells and dies away like a nearby impact.
    const envelope = 0.5 * (1 - Math.cos((2 * Math.PI * t) / length));
    points.push([round(start + t, 9), round(amplitude * envelope * Math.sin(2 * Math.PI * f * t))]);
  }
  points.push([round(start + length + 1e-3, 9), 0]);
  return points;
}

const hydrophonePreamp: ScenarioInput = {
  schema: SCENARIO_SCHEMA_ID,
  name: "Hydrophone preamp",
  supply: { positive: 5, negative: -5 },
  opamp: GENERAL_PURPOSE_BIPOLAR,
  stage: { kind: "noninverting-amplifier", rGround: 2.2e3, rFeedback: 47e3, reference: 0 },
  input: {
    components: [
      { kind: "sine", amplitude: 0.02, frequency: 2500 },
      { kind: "pwl", points: burstPoints() },
    ],
    noise: { rms: 0.001, bandwidth: 20e3, seed: 7 },
  },
  run: { duration: 12e-3, points: 12000 },
};

// ---------------------------------------------------------------------------------------------
// 3. Water-temperature alarm. 10 kΩ NTC (B = 3977 K, Beta model) from the divider node to 0 V
// under 15 kΩ from 5 V: 19 °C → R = 13.15 kΩ → 2.3358 V; 17.5 °C → 14.11 kΩ → 2.4234 V. The node
// falls as the water warms, so the input sits on v− of an inverting Schmitt trigger: output
// high = alarm. Reference divider 7.5 kΩ / 6.8 kΩ from 5 V, Thevenin 2.3776 V behind 3.5664 kΩ;
// rFeedback 200 kΩ. Closed form gives lower 2.3363 V (≈ 18.99 °C) and upper 2.4232 V
// (≈ 17.50 °C): a deadband of only 87 mV, so the noise must stay below 87 mV / 6.6 = 13 mV rms.
export const NTC = { r25: 10e3, beta: 3977, seriesTop: 15e3, supply: 5 } as const;
/** Beta model R(T) = R25·exp(B(1/T − 1/T25)) [published form]; T in °C here. */
export const ntcResistance = (celsius: number) => NTC.r25 * Math.exp(NTC.beta * (1 / (celsius + 273.15) - 1 / 298.15));
/** Divider node voltage for a water temperature in °C. */
export const ntcNodeVolts = (celsius: number) => {
  const r = ntcResistance(celsius);
  return round((NTC.supply * r) / (NTC.seriesTop + r));
};
const referenceTop = 7.5e3;
const referenceBottom = 6.8e3;

function temperatureProfile(): [number, number][] {
  // In °C: the pen warms from 16 °C to 20.5 °C over an afternoon hour and cools back the next
  // hour, with a slow swell; one point per 5 minutes.
  const points: [number, number][] = [];
  for (let t = 0; t <= 7200; t += 300) {
    const ramp = t <= 3600 ? 16 + (4.5 * t) / 3600 : 20.5 - (4.5 * (t - 3600)) / 3600;
    points.push([t, round(ramp + 0.15 * Math.sin((2 * Math.PI * t) / 1800), 4)]);
  }
  return points;
}

const waterTemperatureAlarm: ScenarioInput = {
  schema: SCENARIO_SCHEMA_ID,
  name: "Water-temperature alarm",
  supply: { positive: 5, negative: 0 },
  opamp: RAIL_TO_RAIL_CMOS_1MHZ,
  stage: {
    kind: "schmitt-inverting",
    rFeedback: 200e3,
    referenceDivider: { rTop: referenceTop, rBottom: referenceBottom },
  },
  source: {
    quantity: "water temperature",
    unit: "°C",
    sensor: { kind: "ntc", model: { beta: NTC.beta, r25: NTC.r25 }, rFixed: NTC.seriesTop, position: "bottom" },
  },
  input: {
    components: [{ kind: "pwl", points: temperatureProfile() }],
    // Pick-up at the stage input (volts), well inside the 87 mV deadband.
    noise: { rms: 0.003, bandwidth: 1, seed: 3 },
  },
  run: { duration: 7200, points: 6000, initialOutput: "low" },
  tolerances: { resistor: 0.01, ntcR25: 0.01, ntcBeta: 0.01 },
  spec: {
    schema: "railwise.design-spec/1",
    name: "Alarm above 19 °C, clears below 17.5 °C",
    kind: "schmitt-inverting",
    supply: { positive: 5, negative: 0 },
    opamp: RAIL_TO_RAIL_CMOS_1MHZ,
    target: { upperThreshold: 19, lowerThreshold: 17.5 },
    series: "E24",
    tolerance: 0.01,
    reference: "auto",
    sensor: { kind: "ntc", model: { beta: NTC.beta, r25: NTC.r25 }, rFixed: NTC.seriesTop, position: "bottom" },
  },
};

// ---------------------------------------------------------------------------------------------
// 4. Bilge float bounce filter. A float switch on a 5 V pull-up, recorded at 1 kHz at the
// switch (before the filter): contact bounce when the float lifts, slosh that reopens it for a
// while, and 80 mV rms pickup. An RC filter (`filter`: 4.7 kΩ, 2.2 µF) sits before a
// non-inverting Schmitt trigger, rInput 10 kΩ, rFeedback 47 kΩ, 2.5 V reference, rail-to-rail
// CMOS. The filter capacitor sees 4.7 k ∥ 57 k = 4.34 kΩ: τ = 9.6 ms. At DC the filter resistor
// adds to rInput (14.7 kΩ): upper = Vref(1 + rIn/rFb) − Vol·rIn/rFb = 3.276 V, lower =
// Vref(1 + rIn/rFb) − Voh·rIn/rFb = 1.724 V at the switch. Remove the filter (or switch the kind
// to "comparator") to see the bounce and pickup chatter.
export function bilgeCaptureSamples(): [number, number][] {
  const next = mulberry32(20260412);
  const rate = 1000; // samples per second
  const duration = 2; // s
  // Contact states over time (closed = 4.6 V through the pull-up, open = 0.3 V).
  const toggles = [0.5, 0.503, 0.507, 0.512, 0.52, 0.74, 0.79, 0.93, 0.955, 1.6, 1.606, 1.611];
  const high = 4.6;
  const low = 0.3;
  const samples: [number, number][] = [];
  let state = false;
  let k = 0;
  for (let i = 0; i <= duration * rate; i++) {
    const t = i / rate;
    while (k < toggles.length && toggles[k] <= t) {
      state = !state;
      k++;
    }
    const level = state ? high : low;
    samples.push([round(t, 6), round(level + 0.08 * gaussian(next), 4)]);
  }
  return samples;
}

export const BILGE_CAPTURE = {
  name: "Bilge float, pen 4, rising water",
  sourceFilename: "bilge-float-pen4.csv",
  columns: { time: "time_s", value: "float_v" },
};

const bilgeFloat: ScenarioInput = {
  schema: SCENARIO_SCHEMA_ID,
  name: "Bilge float bounce filter",
  supply: { positive: 5, negative: 0 },
  opamp: RAIL_TO_RAIL_CMOS_1MHZ,
  stage: { kind: "schmitt-noninverting", rInput: 10e3, rFeedback: 47e3, reference: 2.5 },
  filter: { r: 4.7e3, c: 2.2e-6 },
  input: { components: [{ kind: "capture", samples: bilgeCaptureSamples() }] },
  run: { duration: 2, points: 8000, initialOutput: "low" },
};

// ---------------------------------------------------------------------------------------------
// 5. Status-lamp blinker. Relaxation oscillator on 5 V: three 100 kΩ around v+ (the reference
// divider 100 k/100 k from 5 V is 2.5 V behind 50 kΩ; rFeedback 100 kΩ), rTiming 100 kΩ,
// cTiming 4.7 µF. Thresholds 1.673 V / 3.327 V with Voh 4.98 V, Vol 0.02 V; t_high = t_low =
// RC·ln(3.307/1.653) = 0.3258 s → 1.535 Hz (ideal rails: f = 1/(2RC ln 2) = 1.535 Hz).
const statusLamp: ScenarioInput = {
  schema: SCENARIO_SCHEMA_ID,
  name: "Status-lamp blinker",
  supply: { positive: 5, negative: 0 },
  opamp: RAIL_TO_RAIL_CMOS_1MHZ,
  stage: {
    kind: "relaxation-oscillator",
    rReference: 50e3,
    rFeedback: 100e3,
    rTiming: 100e3,
    cTiming: 4.7e-6,
    reference: 2.5,
  },
  input: { components: [{ kind: "dc", level: 0 }] },
  run: { duration: 4, points: 8000, initialOutput: "low" },
};

// ---------------------------------------------------------------------------------------------
// 6. Enclosure humidity flag. The electronics box's humidity sensor gives 0.8 V at 0 %RH and
// 3.2 V at 100 %RH (24 mV per %RH); a comparator-style part on 5 V flags the logger at 75 %RH
// (2.6 V reference on v−). Its open-drain output pulls the logger's 3.3 V input low; the pin has
// a 10 kΩ pull-up to 3.3 V and the logger's 100 kΩ pull-down (a defined level while the logger
// is off). Output transistor off: 3.3 V · 100 k/(10 k + 100 k) = 3.0 V [Ohm's law]; on: Vol
// = 0.1 V. Humidity climbs from 58 %RH to 88 %RH over 20 s and dries back to 62 %RH.
const humidityFlag: ScenarioInput = {
  schema: SCENARIO_SCHEMA_ID,
  name: "Enclosure humidity flag",
  supply: { positive: 5, negative: 0 },
  opamp: FAST_COMPARATOR_STYLE,
  stage: { kind: "comparator", reference: 2.6, inputAt: "noninverting" },
  output: { kind: "open-drain", pullUp: 10e3, pullUpTo: 3.3, load: { r: 100e3, to: 0 } },
  input: {
    components: [
      {
        kind: "pwl",
        points: [
          [0, round(0.8 + 0.024 * 58)],
          [20, round(0.8 + 0.024 * 88)],
          [40, round(0.8 + 0.024 * 62)],
        ],
      },
    ],
  },
  run: { duration: 40, points: 2000 },
};

// ---------------------------------------------------------------------------------------------
// Harrow Marine's own board: a dusk switch (comparator) for the isolation tests and demos.
const duskSwitch: ScenarioInput = {
  schema: SCENARIO_SCHEMA_ID,
  name: "Mooring light dusk switch",
  supply: { positive: 12, negative: 0 },
  opamp: FAST_COMPARATOR_STYLE,
  stage: { kind: "comparator", reference: 1.2, inputAt: "inverting" },
  input: { components: [{ kind: "ramp", from: 3, to: 0.2, start: 1, duration: 8 }] },
  run: { duration: 10, points: 2000 },
};

export interface DemoScenario {
  key: string;
  name: string;
  scenario: ScenarioInput;
}

export const DEMO_SCENARIOS: DemoScenario[] = [
  { key: "battery-cutoff", name: "Battery low-voltage disconnect", scenario: batteryCutoff },
  { key: "hydrophone-preamp", name: "Hydrophone preamp", scenario: hydrophonePreamp },
  { key: "water-temperature-alarm", name: "Water-temperature alarm", scenario: waterTemperatureAlarm },
  { key: "bilge-float", name: "Bilge float bounce filter", scenario: bilgeFloat },
  { key: "status-lamp", name: "Status-lamp blinker", scenario: statusLamp },
  { key: "humidity-flag", name: "Enclosure humidity flag", scenario: humidityFlag },
];

export const HARROW_SCENARIOS: DemoScenario[] = [
  { key: "dusk-switch", name: "Mooring light dusk switch", scenario: duskSwitch },
];
