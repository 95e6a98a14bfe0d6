import { describe, expect, it } from "vitest";
import {
  batteryThresholds,
  betaResistance,
  betaTemperature,
  celsiusToKelvin,
  dividerInput,
  fitBeta,
  fitSteinhartHart,
  kelvinToCelsius,
  linearSensorThresholds,
  linearSensorValue,
  linearSensorVolts,
  ntcDividerTemperature,
  ntcDividerVoltage,
  ntcResistance,
  ntcSelfHeating,
  ntcTemperature,
  steinhartHartResistance,
  steinhartHartTemperature,
  temperatureToVoltageThresholds,
  voltageToTemperatureThresholds,
  type NtcDivider,
} from "@/lib/design/sensors";

// tests/REFERENCES.md, NTC thermistor: three-point Steinhart–Hart fit of a 10 kΩ / B≈3977 K curve
// through 0, 25, 50 °C [derived from a published curve] (Steinhart & Hart, Deep-Sea Research 15, 1968).
const SH = { kind: "steinhart-hart" as const, a: 1.13451e-3, b: 2.33024e-4, c: 9.37746e-8 };
const BETA = { kind: "beta" as const, r0: 10_000, beta: 3977 };

describe("NTC Beta model", () => {
  it("R(0 °C) = 33 900 Ω for B = 3977 K, R25 = 10 kΩ", () => {
    // tests/REFERENCES.md [derived]: R = R25·exp(B(1/T − 1/T25))
    expect(betaResistance(celsiusToKelvin(0), BETA)).toBeCloseTo(33_900, -1);
    expect(betaResistance(298.15, BETA)).toBeCloseTo(10_000, 9);
  });

  it("fits B from two points and round-trips R ↔ T to 0.01 K", () => {
    // B = ln(R1/R2)/(1/T1 − 1/T2) [published formula, tests/REFERENCES.md]
    const r0 = betaResistance(celsiusToKelvin(0), BETA);
    const r50 = betaResistance(celsiusToKelvin(50), BETA);
    expect(fitBeta([celsiusToKelvin(0), r0], [celsiusToKelvin(50), r50])).toBeCloseTo(3977, 9);
    for (let c = -40; c <= 125; c += 5) {
      const t = celsiusToKelvin(c);
      expect(Math.abs(betaTemperature(betaResistance(t, BETA), BETA) - t)).toBeLessThan(0.01);
    }
  });

  it("the Beta model is 4 % above the Steinhart–Hart curve at 0 °C", () => {
    // tests/REFERENCES.md [derived]: 33 900 vs ≈ 32 555 Ω
    const beta = betaResistance(celsiusToKelvin(0), BETA);
    const sh = steinhartHartResistance(celsiusToKelvin(0), SH);
    expect(beta / sh - 1).toBeGreaterThan(0.035);
    expect(beta / sh - 1).toBeLessThan(0.045);
  });
});

describe("NTC Steinhart–Hart", () => {
  it("gives R(25 °C) = 10 000 Ω, R(0 °C) ≈ 32 555 Ω, R(50 °C) ≈ 3 605 Ω", () => {
    // tests/REFERENCES.md values (coefficients rounded to 6 digits there, hence the 0.01 % tolerance)
    expect(steinhartHartResistance(celsiusToKelvin(25), SH) / 10_000 - 1).toBeLessThan(1e-4);
    expect(Math.abs(steinhartHartResistance(celsiusToKelvin(0), SH) / 32_555 - 1)).toBeLessThan(1e-4);
    expect(Math.abs(steinhartHartResistance(celsiusToKelvin(50), SH) / 3_605 - 1)).toBeLessThan(2e-4);
  });

  it("round-trips T → R → T to 0.01 K from −40 to 125 °C", () => {
    // tests/REFERENCES.md: check round trips to 0.01 K
    for (let c = -40; c <= 125; c += 2.5) {
      const t = celsiusToKelvin(c);
      const r = steinhartHartResistance(t, SH);
      expect(Math.abs(steinhartHartTemperature(r, SH) - t)).toBeLessThan(0.01);
      expect(Math.abs(ntcTemperature(SH, ntcResistance(SH, t)) - t)).toBeLessThan(0.01);
    }
  });

  it("fits the three coefficients back from three points", () => {
    // Three points taken from the tests/REFERENCES.md curve; the fit must reproduce A, B, C and the curve.
    const pts = [0, 25, 50].map(
      (c) => [celsiusToKelvin(c), steinhartHartResistance(celsiusToKelvin(c), SH)] as [number, number],
    );
    const fit = fitSteinhartHart(pts as [[number, number], [number, number], [number, number]]);
    expect(fit.a).toBeCloseTo(SH.a, 10);
    expect(fit.b / SH.b).toBeCloseTo(1, 8);
    expect(fit.c / SH.c).toBeCloseTo(1, 6);
    // From the rounded published resistances the curve still matches to 0.01 K at 10 and 40 °C.
    const rounded = fitSteinhartHart([
      [celsiusToKelvin(0), 32_555],
      [celsiusToKelvin(25), 10_000],
      [celsiusToKelvin(50), 3_605],
    ]);
    for (const c of [10, 40]) {
      const r = steinhartHartResistance(celsiusToKelvin(c), SH);
      expect(Math.abs(kelvinToCelsius(steinhartHartTemperature(r, rounded)) - c)).toBeLessThan(0.01);
    }
  });
});

describe("NTC divider", () => {
  const divider: NtcDivider = { model: BETA, rFixed: 10_000, supply: 5, position: "bottom" };

  it("10 kΩ NTC under 10 kΩ from 5 V at 25 °C: 2.500 V and 0.625 mW", () => {
    // tests/REFERENCES.md, self-heating [common practice]
    expect(ntcDividerVoltage(divider, 298.15)).toBeCloseTo(2.5, 12);
    const sh = ntcSelfHeating(divider, 298.15, { dissipationConstant: 1.5e-3, accuracy: 0.5 });
    expect(sh.power).toBeCloseTo(0.625e-3, 12);
    expect(sh.ntcVoltage).toBeCloseTo(2.5, 12);
    // rise = P/δ = 0.625 mW / 1.5 mW/K = 0.4167 K > ¼ of 0.5 K → warning (tests/REFERENCES.md ¼–1/10 rule)
    expect(sh.temperatureRise).toBeCloseTo(0.41667, 4);
    expect(sh.warning).toMatch(/self-heating/);
    const cool = ntcSelfHeating({ ...divider, rFixed: 100_000 }, 298.15, {
      dissipationConstant: 1.5e-3,
      accuracy: 0.5,
    });
    expect(cool.power).toBeCloseTo((5 / 110_000) ** 2 * 10_000, 15); // I²R [published: Joule's law]
    expect(cool.warning).toBeNull();
  });

  it("maps temperature thresholds to voltages and back (NTC at the bottom inverts)", () => {
    // The water-temperature alarm of the demo data (DEVELOPERS.md § Demo data): above 19 °C, clears below 17.5 °C.
    const v = temperatureToVoltageThresholds(divider, { upper: celsiusToKelvin(19), lower: celsiusToKelvin(17.5) });
    expect(v.inverted).toBe(true);
    expect(v.upperThreshold).toBeGreaterThan(v.lowerThreshold);
    expect(v.lowerThreshold).toBeCloseTo(ntcDividerVoltage(divider, celsiusToKelvin(19)), 12);
    const back = voltageToTemperatureThresholds(divider, v);
    expect(Math.abs(back.upper - celsiusToKelvin(19))).toBeLessThan(0.01);
    expect(Math.abs(back.lower - celsiusToKelvin(17.5))).toBeLessThan(0.01);
    const top = { ...divider, position: "top" as const };
    expect(temperatureToVoltageThresholds(top, { upper: 300, lower: 290 }).inverted).toBe(false);
    expect(Math.abs(ntcDividerTemperature(top, ntcDividerVoltage(top, 310)) - 310)).toBeLessThan(0.01);
  });
});

describe("linear sensor and battery divider", () => {
  it("linear sensor: 10 mV/°C with 0.5 V offset (common practice, no source)", () => {
    const s = { voltsPerUnit: 0.01, offset: 0.5 };
    expect(linearSensorVolts(s, 25)).toBeCloseTo(0.75, 12);
    expect(linearSensorValue(s, 0.75)).toBeCloseTo(25, 12);
    expect(linearSensorThresholds(s, { upper: 30, lower: 20 })).toEqual({
      upperThreshold: 0.8,
      lowerThreshold: 0.7,
      inverted: false,
    });
  });

  it("battery divider: 12.5 V / 11.4 V through 100 kΩ : 33 kΩ (voltage divider rule)", () => {
    // Vout = Vin·R2/(R1 + R2) [published: any circuits text]
    const d = { rTop: 100_000, rBottom: 33_000 };
    const t = batteryThresholds(d, { upper: 12.5, lower: 11.4 });
    expect(t.upperThreshold).toBeCloseTo((12.5 * 33) / 133, 12);
    expect(t.lowerThreshold).toBeCloseTo((11.4 * 33) / 133, 12);
    expect(t.sourceResistance).toBeCloseTo(((100 * 33) / 133) * 1000, 6);
    expect(dividerInput(d, t.upperThreshold)).toBeCloseTo(12.5, 12);
  });
});
