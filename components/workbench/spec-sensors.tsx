"use client";
// How the quantity the engineer cares about reaches the stage input: directly in volts,
// through a resistive divider (battery volts), or as a temperature through an NTC divider.
import { QuantityField } from "./quantity-field";
import { SelectRow } from "./controls";
import { ntcDividerVolts } from "./ntc-bridge";

export type SensorSetup =
  | { kind: "volts" }
  | { kind: "divider"; rTop: number; rBottom: number }
  | { kind: "ntc"; r25: number; beta: number; rFixed: number; position: "top" | "bottom"; vSupply: number };

export function defaultSensor(vSupply: number): SensorSetup {
  void vSupply;
  return { kind: "volts" };
}

/** Sensor units → volts at the stage input. */
export function sensorToInput(s: SensorSetup, value: number): number {
  switch (s.kind) {
    case "volts":
      return value;
    case "divider":
      // Unloaded divider: v = V·rBottom/(rTop + rBottom).
      return (value * s.rBottom) / (s.rTop + s.rBottom);
    case "ntc":
      return ntcDividerVolts({ celsius: value, r25: s.r25, beta: s.beta, rFixed: s.rFixed, position: s.position, vSupply: s.vSupply });
  }
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
          if (k === "ntc") onChange({ kind: "ntc", r25: 10e3, beta: 3977, rFixed: 10e3, position: "bottom", vSupply: 5 });
        }}
      >
        <option value="volts">volts at the stage input</option>
        <option value="divider">volts at a source, through a divider</option>
        <option value="ntc">temperature, NTC thermistor divider</option>
      </SelectRow>
      {sensor.kind === "divider" ? (
        <div className="ml-3 border-l-2 border-paper-line pl-2">
          <QuantityField label="Divider top" name="spec.rTop" unit="Ω" value={sensor.rTop} onCommit={(v) => onChange({ ...sensor, rTop: v })} validate={(v) => (v > 0 ? null : "must be above 0")} />
          <QuantityField label="Divider bottom" name="spec.rBottom" unit="Ω" value={sensor.rBottom} onCommit={(v) => onChange({ ...sensor, rBottom: v })} validate={(v) => (v > 0 ? null : "must be above 0")} />
        </div>
      ) : null}
      {sensor.kind === "ntc" ? (
        <div className="ml-3 border-l-2 border-paper-line pl-2">
          <QuantityField label="NTC at 25 °C" name="spec.r25" unit="Ω" value={sensor.r25} onCommit={(v) => onChange({ ...sensor, r25: v })} validate={(v) => (v > 0 ? null : "must be above 0")} />
          <QuantityField label="Beta (K)" name="spec.beta" unit="K" plain value={sensor.beta} onCommit={(v) => onChange({ ...sensor, beta: v })} validate={(v) => (v > 0 ? null : "must be above 0")} />
          <QuantityField label="Fixed resistor" name="spec.rFixed" unit="Ω" value={sensor.rFixed} onCommit={(v) => onChange({ ...sensor, rFixed: v })} validate={(v) => (v > 0 ? null : "must be above 0")} />
          <QuantityField label="Divider supply" name="spec.vSupply" unit="V" value={sensor.vSupply} onCommit={(v) => onChange({ ...sensor, vSupply: v })} validate={(v) => (v > 0 ? null : "must be above 0")} />
          <SelectRow label="NTC sits" value={sensor.position} onChange={(e) => onChange({ ...sensor, position: e.target.value as "top" | "bottom" })}>
            <option value="bottom">at the bottom (volts fall as it warms)</option>
            <option value="top">at the top (volts rise as it warms)</option>
          </SelectRow>
        </div>
      ) : null}
    </>
  );
}
