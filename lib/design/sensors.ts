// Sensor front ends that turn a physical threshold into the voltage thresholds a stage is designed
// for: NTC thermistor (Beta model or Steinhart–Hart) in a divider, linear sensor, battery divider.
// Temperatures in kelvin in the math (SI), helpers for °C at the edges.

export const ZERO_CELSIUS = 273.15;
export const T25 = 298.15;

export const celsiusToKelvin = (c: number) => c + ZERO_CELSIUS;
export const kelvinToCelsius = (k: number) => k - ZERO_CELSIUS;

const positive = (v: number, what: string) => {
  if (!(Number.isFinite(v) && v > 0)) throw new RangeError(`${what} must be positive and finite (got ${v})`);
};

// ---------------------------------------------------------------------------------------------
// NTC models

/** Beta model: R = R0·exp(B(1/T − 1/T0)), T in kelvin; T0 defaults to 25 °C. */
export interface BetaModel {
  kind: "beta";
  r0: number;
  beta: number;
  t0?: number;
}

/** Steinhart–Hart (1968): 1/T = A + B·ln R + C·(ln R)³. */
export interface SteinhartHartModel {
  kind: "steinhart-hart";
  a: number;
  b: number;
  c: number;
}

export type NtcModel = BetaModel | SteinhartHartModel;

export function betaResistance(tKelvin: number, m: Omit<BetaModel, "kind">): number {
  positive(tKelvin, "temperature (K)");
  return m.r0 * Math.exp(m.beta * (1 / tKelvin - 1 / (m.t0 ?? T25)));
}

export function betaTemperature(ohms: number, m: Omit<BetaModel, "kind">): number {
  positive(ohms, "resistance");
  return 1 / (1 / (m.t0 ?? T25) + Math.log(ohms / m.r0) / m.beta);
}

/** B = ln(R1/R2)/(1/T1 − 1/T2) from two [T (K), R (Ω)] points. */
export function fitBeta(p1: [number, number], p2: [number, number]): number {
  const [t1, r1] = p1;
  const [t2, r2] = p2;
  positive(t1, "T1");
  positive(t2, "T2");
  positive(r1, "R1");
  positive(r2, "R2");
  if (t1 === t2) throw new RangeError("fitBeta needs two different temperatures");
  return Math.log(r1 / r2) / (1 / t1 - 1 / t2);
}

export function steinhartHartTemperature(ohms: number, m: Omit<SteinhartHartModel, "kind">): number {
  positive(ohms, "resistance");
  const x = Math.log(ohms);
  return 1 / (m.a + m.b * x + m.c * x * x * x);
}

/**
 * Inverse of Steinhart–Hart: C·x³ + B·x + (A − 1/T) = 0 with x = ln R, a depressed cubic with one
 * real root for B, C > 0 (Cardano).
 */
export function steinhartHartResistance(tKelvin: number, m: Omit<SteinhartHartModel, "kind">): number {
  positive(tKelvin, "temperature (K)");
  if (m.c === 0) return Math.exp((1 / tKelvin - m.a) / m.b);
  const p = m.b / m.c;
  const q = (m.a - 1 / tKelvin) / m.c;
  const disc = Math.sqrt((q * q) / 4 + (p * p * p) / 27);
  const x = Math.cbrt(-q / 2 + disc) + Math.cbrt(-q / 2 - disc);
  return Math.exp(x);
}

/** Steinhart–Hart coefficients through three [T (K), R (Ω)] points (exact 3×3 solve). */
export function fitSteinhartHart(
  points: [[number, number], [number, number], [number, number]],
): Omit<SteinhartHartModel, "kind"> {
  const rows = points.map(([t, r]) => {
    positive(t, "temperature (K)");
    positive(r, "resistance");
    const x = Math.log(r);
    return [1, x, x * x * x, 1 / t];
  });
  // Gaussian elimination with partial pivoting on [1, x, x³ | 1/T].
  for (let col = 0; col < 3; col++) {
    let piv = col;
    for (let r = col + 1; r < 3; r++) if (Math.abs(rows[r][col]) > Math.abs(rows[piv][col])) piv = r;
    [rows[col], rows[piv]] = [rows[piv], rows[col]];
    if (Math.abs(rows[col][col]) < 1e-300) throw new RangeError("fitSteinhartHart needs three distinct points");
    for (let r = 0; r < 3; r++) {
      if (r === col) continue;
      const f = rows[r][col] / rows[col][col];
      for (let k = col; k < 4; k++) rows[r][k] -= f * rows[col][k];
    }
  }
  const [a, b, c] = [0, 1, 2].map((i) => rows[i][3] / rows[i][i]);
  if (![a, b, c].every(Number.isFinite)) throw new RangeError("fitSteinhartHart: the points do not determine a curve");
  return { a, b, c };
}

export function ntcResistance(model: NtcModel, tKelvin: number): number {
  return model.kind === "beta" ? betaResistance(tKelvin, model) : steinhartHartResistance(tKelvin, model);
}

export function ntcTemperature(model: NtcModel, ohms: number): number {
  return model.kind === "beta" ? betaTemperature(ohms, model) : steinhartHartTemperature(ohms, model);
}

// ---------------------------------------------------------------------------------------------
// NTC in a divider

/**
 * The NTC and a fixed resistor across `supply` volts (bottom end at 0 V). `position` is where the
 * NTC sits: "bottom" (node to 0 V: the node falls as the temperature rises) or "top".
 */
export interface NtcDivider {
  model: NtcModel;
  rFixed: number;
  supply: number;
  position: "top" | "bottom";
}

export function ntcDividerVoltage(d: NtcDivider, tKelvin: number): number {
  const rt = ntcResistance(d.model, tKelvin);
  const rBottom = d.position === "bottom" ? rt : d.rFixed;
  return (d.supply * rBottom) / (rt + d.rFixed);
}

export function ntcDividerTemperature(d: NtcDivider, volts: number): number {
  if (!(volts > 0 && volts < d.supply))
    throw new RangeError(`divider voltage ${volts} V must lie strictly between 0 and ${d.supply} V`);
  // bottom: V = S·Rt/(Rt + Rf) → Rt = Rf·V/(S − V); top: V = S·Rf/(Rt + Rf) → Rt = Rf·(S − V)/V.
  const rt =
    d.position === "bottom" ? (d.rFixed * volts) / (d.supply - volts) : (d.rFixed * (d.supply - volts)) / volts;
  return ntcTemperature(d.model, rt);
}

/**
 * Temperature thresholds (K) → the voltage thresholds of the stage that follows. With the NTC at
 * the bottom the node falls as it warms, so the hotter threshold becomes the lower voltage:
 * `inverted` says so (an "above T" alarm then needs a stage whose output acts on a falling input).
 */
export function temperatureToVoltageThresholds(d: NtcDivider, t: { upper: number; lower: number }) {
  if (!(t.upper > t.lower)) throw new RangeError("upper temperature must be above the lower one");
  const vAtUpper = ntcDividerVoltage(d, t.upper);
  const vAtLower = ntcDividerVoltage(d, t.lower);
  const inverted = vAtUpper < vAtLower;
  return {
    upperThreshold: Math.max(vAtUpper, vAtLower),
    lowerThreshold: Math.min(vAtUpper, vAtLower),
    /** True when rising temperature gives a falling voltage. */
    inverted,
  };
}

/** Voltage thresholds → temperatures (K), the inverse of temperatureToVoltageThresholds. */
export function voltageToTemperatureThresholds(d: NtcDivider, v: { upperThreshold: number; lowerThreshold: number }) {
  const a = ntcDividerTemperature(d, v.upperThreshold);
  const b = ntcDividerTemperature(d, v.lowerThreshold);
  return { upper: Math.max(a, b), lower: Math.min(a, b) };
}

export interface SelfHeating {
  ntcOhms: number;
  ntcVoltage: number;
  current: number;
  /** Power dissipated in the NTC (W). */
  power: number;
  /** Temperature rise = power / δ (K). */
  temperatureRise: number;
  /** The largest rise accepted (K). */
  limit: number;
  warning: string | null;
}

/**
 * Self-heating of the NTC at temperature T: P = V²/R_ntc, rise = P/δ with δ the dissipation
 * constant (W/K). Keep the rise to ¼ of the accuracy wanted (tests/REFERENCES.md: ¼–1/10, common
 * practice); `maxRise` overrides that limit.
 */
export function ntcSelfHeating(
  d: NtcDivider,
  tKelvin: number,
  opts: { dissipationConstant: number; accuracy?: number; maxRise?: number },
): SelfHeating {
  positive(opts.dissipationConstant, "dissipationConstant (W/K)");
  const ntcOhms = ntcResistance(d.model, tKelvin);
  const current = d.supply / (ntcOhms + d.rFixed);
  const ntcVoltage = current * ntcOhms;
  const power = ntcVoltage * current;
  const temperatureRise = power / opts.dissipationConstant;
  const limit = opts.maxRise ?? (opts.accuracy ?? 0.5) / 4;
  const warning =
    temperatureRise > limit
      ? `self-heating: ${(power * 1e3).toFixed(3)} mW in the NTC raises it ${temperatureRise.toFixed(3)} K, above the ${limit.toFixed(3)} K allowed; use a larger fixed resistor, a lower divider supply or pulse the divider`
      : null;
  return { ntcOhms, ntcVoltage, current, power, temperatureRise, limit, warning };
}

// ---------------------------------------------------------------------------------------------
// Linear sensor and voltage divider

/** A sensor with a linear output: V = offset + voltsPerUnit·x. */
export interface LinearSensor {
  voltsPerUnit: number;
  offset: number;
}

export function linearSensorVolts(s: LinearSensor, x: number): number {
  return s.offset + s.voltsPerUnit * x;
}

export function linearSensorValue(s: LinearSensor, volts: number): number {
  if (s.voltsPerUnit === 0) throw new RangeError("voltsPerUnit must not be 0");
  return (volts - s.offset) / s.voltsPerUnit;
}

/** Physical thresholds → voltage thresholds (sorted; `inverted` when the slope is negative). */
export function linearSensorThresholds(s: LinearSensor, t: { upper: number; lower: number }) {
  if (!(t.upper > t.lower)) throw new RangeError("upper must be above lower");
  const a = linearSensorVolts(s, t.upper);
  const b = linearSensorVolts(s, t.lower);
  return { upperThreshold: Math.max(a, b), lowerThreshold: Math.min(a, b), inverted: s.voltsPerUnit < 0 };
}

/** A battery (or any voltage) through rTop into the node, rBottom from the node to 0 V. */
export interface VoltageDivider {
  rTop: number;
  rBottom: number;
}

export function dividerRatio(d: VoltageDivider): number {
  positive(d.rTop, "rTop");
  positive(d.rBottom, "rBottom");
  return d.rBottom / (d.rTop + d.rBottom);
}

export function dividerOutput(d: VoltageDivider, vIn: number): number {
  return vIn * dividerRatio(d);
}

export function dividerInput(d: VoltageDivider, vOut: number): number {
  return vOut / dividerRatio(d);
}

/** Battery cut/reconnect voltages → node thresholds, plus the divider's source resistance. */
export function batteryThresholds(d: VoltageDivider, v: { upper: number; lower: number }) {
  if (!(v.upper > v.lower)) throw new RangeError("upper must be above lower");
  return {
    upperThreshold: dividerOutput(d, v.upper),
    lowerThreshold: dividerOutput(d, v.lower),
    sourceResistance: (d.rTop * d.rBottom) / (d.rTop + d.rBottom),
    /** Current drawn from the battery at the upper voltage (A). */
    drain: v.upper / (d.rTop + d.rBottom),
  };
}

// ---------------------------------------------------------------------------------------------
// A sensor in front of a threshold stage (the design spec's `sensor`)

export type SensorSpec =
  | {
      kind: "ntc";
      model:
        | { beta: number; r25: number; t0?: number }
        | { a: number; b: number; c: number }
        | { points: [number, number][] };
      rFixed: number;
      position: "top" | "bottom";
      supplyVoltage?: number;
      dissipationConstant?: number;
      accuracy?: number;
    }
  | { kind: "linear"; voltsPerUnit: number; offset: number; unit?: string }
  | { kind: "divider"; rTop: number; rBottom: number };

export interface SensorFrontEnd {
  unit: string;
  /** Rising quantity gives a falling voltage at the stage input. */
  inverted: boolean;
  toVolts(x: number): number;
  /** Null when the voltage is outside what the sensor can produce. */
  toUnits(v: number): number | null;
  /** NTC only: self-heating at the quantity x (°C). */
  selfHeating?: (x: number) => SelfHeating;
}

/** Build the mapping quantity ↔ stage-input volts for a spec's sensor; NTC temperatures in °C. */
export function sensorFrontEnd(sensor: SensorSpec, defaultSupply: number): SensorFrontEnd {
  switch (sensor.kind) {
    case "ntc": {
      const m = sensor.model;
      const model: NtcModel =
        "beta" in m
          ? { kind: "beta", r0: m.r25, beta: m.beta, t0: celsiusToKelvin(m.t0 ?? 25) }
          : "points" in m
            ? {
                kind: "steinhart-hart",
                ...fitSteinhartHart(
                  m.points.map(([c, r]) => [celsiusToKelvin(c), r]) as [
                    [number, number],
                    [number, number],
                    [number, number],
                  ],
                ),
              }
            : { kind: "steinhart-hart", ...m };
      const d: NtcDivider = {
        model,
        rFixed: sensor.rFixed,
        supply: sensor.supplyVoltage ?? defaultSupply,
        position: sensor.position,
      };
      return {
        unit: "°C",
        inverted: sensor.position === "bottom",
        toVolts: (c) => ntcDividerVoltage(d, celsiusToKelvin(c)),
        toUnits: (v) => (v > 0 && v < d.supply ? kelvinToCelsius(ntcDividerTemperature(d, v)) : null),
        selfHeating: (c) =>
          ntcSelfHeating(d, celsiusToKelvin(c), {
            dissipationConstant: sensor.dissipationConstant ?? 1e-3,
            accuracy: sensor.accuracy,
          }),
      };
    }
    case "linear":
      return {
        unit: sensor.unit ?? "unit",
        inverted: sensor.voltsPerUnit < 0,
        toVolts: (x) => linearSensorVolts(sensor, x),
        toUnits: (v) => linearSensorValue(sensor, v),
      };
    case "divider":
      return {
        unit: "V",
        inverted: false,
        toVolts: (x) => dividerOutput(sensor, x),
        toUnits: (v) => dividerInput(sensor, v),
      };
  }
}
