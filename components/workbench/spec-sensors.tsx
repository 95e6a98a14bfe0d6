"use client";
// How the quantity the engineer cares about reaches the stage input: directly in volts,
// through a resistive divider (battery volts), or as a temperature through an NTC divider.
import { QuantityField } from "./quantity-field";
import { SelectRow } from "./controls";
import { sensorFrontEnd, type SensorFrontEnd } from "@/lib/design/sensors";

export type SensorSetup =
  | { kind: "volts" }
  | { kind: "divider"; rTop: number; rBottom: number }
  | { kind: "ntc"; r25: number; beta: number; rFixed: number; position: "top" | "bottom"; vSupply: number };

export function defaultSensor(vSupply: number): SensorSetup {
  void vSupply;
  return { kind: "volts" };
}

/** The sensor chain as lib/design/sensors.ts models it (null: thresholds are already input volts). */
export function frontEndOf(s: SensorSetup): SensorFrontEnd | null {
  switch (s.kind) {
    case "volts":
      return null;
    case "divider":
      return sensorFrontEnd({ kind: "divider", rTop: s.rTop, rBottom: s.rBottom }, s.rTop);
    case "ntc":
      return sensorFrontEnd(
        {
          kind: "ntc",
          model: { beta: s.beta, r25: s.r25 },
          rFixed: s.rFixed,
          position: s.position,
          supplyVoltage: s.vSupply,
        },
        s.vSupply,
      );
  }
}

/** Sensor units → volts at the stage input. */
export function sensorToInput(s: SensorSetup, value: number): number {
  const fe = frontEndOf(s);
  return fe ? fe.toVolts(value) : value;
}

export function SensorFields({ sensor, onChange }: { sensor: SensorSetup; onChange: (s: SensorSetup) => void }) {
  return (
    <>
      <SelectRow
        label="Thresholds as"
        name="spec.sensor"
        value={sensor.kind}
        onChange={(e) => {
          const k = e.target.value as SensorSetup["kind"];
          if (k === "volts") onChange({ kind: "volts" });
          if (k === "divider") onChange({ kind: "divider", rTop: 68e3, rBottom: 18e3 });
          if (k === "ntc")
            onChange({ kind: "ntc", r25: 10e3, beta: 3977, rFixed: 15e3, position: "bottom", vSupply: 5 });
        }}
      >
        <option value="volts">volts at the stage input</option>
        <option value="divider">volts at a source, through a divider</option>
        <option value="ntc">temperature, NTC thermistor divider</option>
      </SelectRow>
      {sensor.kind === "divider" ? (
        <div className="ml-3 border-l-2 border-paper-line pl-2">
          <QuantityField
            label="Divider top"
            name="spec.rTop"
            unit="Ω"
            value={sensor.rTop}
            onCommit={(v) => onChange({ ...sensor, rTop: v })}
            validate={(v) => (v > 0 ? null : "must be above 0")}
          />
          <QuantityField
            label="Divider bottom"
            name="spec.rBottom"
            unit="Ω"
            value={sensor.rBottom}
            onCommit={(v) => onChange({ ...sensor, rBottom: v })}
            validate={(v) => (v > 0 ? null : "must be above 0")}
          />
        </div>
      ) : null}
      {sensor.kind === "ntc" ? (
        <div className="ml-3 border-l-2 border-paper-line pl-2">
          <QuantityField
            label="NTC at 25 °C"
            name="spec.r25"
            unit="Ω"
            value={sensor.r25}
            onCommit={(v) => onChange({ ...sensor, r25: v })}
            validate={(v) => (v > 0 ? null : "must be above 0")}
          />
          <QuantityField
            label="Beta (K)"
            name="spec.beta"
            unit="K"
            plain
            value={sensor.beta}
            onCommit={(v) => onChange({ ...sensor, beta: v })}
            validate={(v) => (v > 0 ? null : "must be above 0")}
          />
          <QuantityField
            label="Fixed resistor"
            name="spec.rFixed"
            unit="Ω"
            value={sensor.rFixed}
            onCommit={(v) => onChange({ ...sensor, rFixed: v })}
            validate={(v) => (v > 0 ? null : "must be above 0")}
          />
          <QuantityField
            label="Divider supply"
            name="spec.vSupply"
            unit="V"
            value={sensor.vSupply}
            onCommit={(v) => onChange({ ...sensor, vSupply: v })}
            validate={(v) => (v > 0 ? null : "must be above 0")}
          />
          <SelectRow
            label="NTC sits"
            value={sensor.position}
            onChange={(e) => onChange({ ...sensor, position: e.target.value as "top" | "bottom" })}
          >
            <option value="bottom">at the bottom (volts fall as it warms)</option>
            <option value="top">at the top (volts rise as it warms)</option>
          </SelectRow>
        </div>
      ) : null}
    </>
  );
}
