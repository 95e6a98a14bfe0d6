// NTC divider → volts for the "From spec" form. Until lib/design/sensors.ts lands this holds
// the Beta model itself: R = R25·exp(B(1/T − 1/T25)), T in kelvin (REFERENCES.md, NTC
// thermistor, [published]); the divider is unloaded.
export interface NtcDividerInput {
  celsius: number;
  r25: number;
  beta: number;
  rFixed: number;
  position: "top" | "bottom";
  vSupply: number;
}

export function ntcDividerVolts({ celsius, r25, beta, rFixed, position, vSupply }: NtcDividerInput): number {
  const T = celsius + 273.15;
  if (!(T > 0)) throw new RangeError("temperature must be above absolute zero");
  const r = r25 * Math.exp(beta * (1 / T - 1 / 298.15));
  return position === "bottom" ? (vSupply * r) / (r + rFixed) : (vSupply * rFixed) / (r + rFixed);
}
