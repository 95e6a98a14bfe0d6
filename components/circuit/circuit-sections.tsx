"use client";
// The circuit as built in the stage editor: the reference as a voltage or a divider from the
// supply, the source in front of the stage (battery divider, NTC divider, linear sensor), the RC
// filter and the output type. Edits keep the draft a valid scenario: with a reference divider the
// stage carries the divider's Thevenin values, which the scenario schema accepts back.
import type { ReactNode } from "react";
import { referenceDividerThevenin, type Scenario } from "@/lib/schemas/scenario";
import { QuantityField } from "@/components/workbench/quantity-field";
import { Section, SelectRow } from "@/components/workbench/controls";
import { useWb } from "@/components/workbench/store";

const ohmsRule = (v: number) => (v > 0 ? (v <= 1e12 ? null : "at most 1 TΩ") : "must be above 0");
const positiveRule = (v: number) => (v > 0 ? null : "must be above 0");

/** Refill the divider's Thevenin values into the stage (open-circuit voltage; rReference where it replaces it). */
export function syncReferenceDivider(d: Scenario): void {
  const div = d.stage.referenceDivider;
  if (!div) return;
  const th = referenceDividerThevenin(div, d.supply);
  d.stage.reference = th.voltage;
  if (d.stage.kind === "schmitt-inverting" || d.stage.kind === "relaxation-oscillator")
    d.stage.rReference = th.resistance;
}

function TextRow({
  label,
  name,
  value,
  disabled,
  onCommit,
  placeholder,
  maxLength,
}: {
  label: string;
  name: string;
  value: string;
  disabled?: boolean;
  onCommit: (v: string) => void;
  placeholder?: string;
  maxLength: number;
}) {
  return (
    <label className="grid grid-cols-[7.5rem_minmax(0,1fr)] items-center gap-x-2 py-0.5">
      <span className="text-[13px] leading-tight break-words text-ink-soft">{label}</span>
      <input
        name={name}
        className="min-w-0 rounded border border-paper-line bg-white px-1.5 py-0.5 text-[13px]"
        defaultValue={value}
        placeholder={placeholder}
        maxLength={maxLength}
        disabled={disabled}
        onBlur={(e) => onCommit(e.target.value.trim())}
      />
    </label>
  );
}

function Note({ children }: { children: ReactNode }) {
  return <p className="mb-1 ml-[8rem] text-[11.5px] leading-snug text-ink-mute">{children}</p>;
}

export function ReferenceSection({ readOnly = false }: { readOnly?: boolean }) {
  const stage = useWb((s) => s.draft.stage);
  const supply = useWb((s) => s.draft.supply);
  const edit = useWb((s) => s.edit);
  const div = stage.referenceDivider;
  return (
    <>
      <SelectRow
        label="Reference from"
        name="stage.referenceMode"
        value={div ? "divider" : "voltage"}
        disabled={readOnly}
        onChange={(e) =>
          edit((d) => {
            if (e.target.value === "divider") {
              d.stage.referenceDivider = { rTop: 10e3, rBottom: 10e3 };
              syncReferenceDivider(d);
            } else delete d.stage.referenceDivider;
          })
        }
      >
        <option value="voltage">a voltage</option>
        <option value="divider">a divider from the supply</option>
      </SelectRow>
      {div ? (
        <>
          <QuantityField
            name="stage.referenceDivider.rTop"
            label="Divider top"
            hint="positive supply to the reference node"
            unit="Ω"
            value={div.rTop}
            validate={ohmsRule}
            disabled={readOnly}
            onCommit={(v) =>
              edit((d) => {
                if (d.stage.referenceDivider) {
                  d.stage.referenceDivider.rTop = v;
                  syncReferenceDivider(d);
                }
              })
            }
          />
          <QuantityField
            name="stage.referenceDivider.rBottom"
            label="Divider bottom"
            hint="reference node to 0 V"
            unit="Ω"
            value={div.rBottom}
            validate={ohmsRule}
            disabled={readOnly}
            onCommit={(v) =>
              edit((d) => {
                if (d.stage.referenceDivider) {
                  d.stage.referenceDivider.rBottom = v;
                  syncReferenceDivider(d);
                }
              })
            }
          />
          <Note>
            The reference node sits at {referenceDividerThevenin(div, supply).voltage.toFixed(4)} V and follows the
            supply.
            {stage.kind === "schmitt-inverting" || stage.kind === "relaxation-oscillator"
              ? " Both resistors meet v+ with the feedback resistor (no separate reference resistor)."
              : ""}
          </Note>
        </>
      ) : null}
    </>
  );
}

export function CircuitSections({ readOnly = false }: { readOnly?: boolean }) {
  const source = useWb((s) => s.draft.source);
  const filter = useWb((s) => s.draft.filter);
  const output = useWb((s) => s.draft.output);
  const kind = useWb((s) => s.draft.stage.kind);
  const edit = useWb((s) => s.edit);
  const sensor = source?.sensor;
  return (
    <>
      <Section title="Source">
        <SelectRow
          label="Watched through"
          name="source.sensor.kind"
          value={sensor?.kind ?? "none"}
          disabled={readOnly}
          onChange={(e) =>
            edit((d) => {
              const k = e.target.value;
              if (k === "none") delete d.source;
              else if (k === "divider")
                d.source = {
                  ...(d.source ?? {}),
                  unit: undefined,
                  sensor: { kind: "divider", rTop: 68e3, rBottom: 18e3 },
                };
              else if (k === "ntc")
                d.source = {
                  ...(d.source ?? {}),
                  unit: undefined,
                  sensor: { kind: "ntc", model: { beta: 3977, r25: 10e3 }, rFixed: 10e3, position: "bottom" },
                };
              else
                d.source = {
                  ...(d.source ?? {}),
                  unit: undefined,
                  sensor: { kind: "linear", voltsPerUnit: 0.01, offset: 0, unit: "unit" },
                };
            })
          }
        >
          <option value="none">nothing (the input is the pin voltage)</option>
          <option value="divider">a resistive divider (e.g. battery volts)</option>
          <option value="ntc">an NTC thermistor divider (°C)</option>
          <option value="linear">a linear sensor</option>
        </SelectRow>
        {source && sensor ? (
          <>
            <TextRow
              label="Quantity"
              name="source.quantity"
              value={source.quantity ?? ""}
              placeholder="e.g. battery"
              maxLength={60}
              disabled={readOnly}
              onCommit={(v) =>
                edit((d) => {
                  if (d.source) d.source.quantity = v || undefined;
                })
              }
            />
            {sensor.kind === "divider" ? (
              <>
                <QuantityField
                  name="source.sensor.rTop"
                  label="Divider top"
                  hint="source to the stage input"
                  unit="Ω"
                  value={sensor.rTop}
                  validate={ohmsRule}
                  disabled={readOnly}
                  onCommit={(v) =>
                    edit((d) => {
                      if (d.source?.sensor.kind === "divider") d.source.sensor.rTop = v;
                    })
                  }
                />
                <QuantityField
                  name="source.sensor.rBottom"
                  label="Divider bottom"
                  hint="stage input to 0 V"
                  unit="Ω"
                  value={sensor.rBottom}
                  validate={ohmsRule}
                  disabled={readOnly}
                  onCommit={(v) =>
                    edit((d) => {
                      if (d.source?.sensor.kind === "divider") d.source.sensor.rBottom = v;
                    })
                  }
                />
              </>
            ) : null}
            {sensor.kind === "ntc" ? (
              <>
                {"beta" in sensor.model ? (
                  <>
                    <QuantityField
                      name="source.sensor.model.r25"
                      label="NTC at 25 °C"
                      unit="Ω"
                      value={sensor.model.r25}
                      validate={positiveRule}
                      disabled={readOnly}
                      onCommit={(v) =>
                        edit((d) => {
                          if (d.source?.sensor.kind === "ntc" && "beta" in d.source.sensor.model)
                            d.source.sensor.model.r25 = v;
                        })
                      }
                    />
                    <QuantityField
                      name="source.sensor.model.beta"
                      label="NTC Beta"
                      unit="K"
                      plain
                      value={sensor.model.beta}
                      validate={positiveRule}
                      disabled={readOnly}
                      onCommit={(v) =>
                        edit((d) => {
                          if (d.source?.sensor.kind === "ntc" && "beta" in d.source.sensor.model)
                            d.source.sensor.model.beta = v;
                        })
                      }
                    />
                  </>
                ) : (
                  <Note>NTC curve given by coefficients or points (edit it in the scenario JSON).</Note>
                )}
                <QuantityField
                  name="source.sensor.rFixed"
                  label="Fixed resistor"
                  unit="Ω"
                  value={sensor.rFixed}
                  validate={ohmsRule}
                  disabled={readOnly}
                  onCommit={(v) =>
                    edit((d) => {
                      if (d.source?.sensor.kind === "ntc") d.source.sensor.rFixed = v;
                    })
                  }
                />
                <SelectRow
                  label="NTC sits"
                  name="source.sensor.position"
                  value={sensor.position}
                  disabled={readOnly}
                  onChange={(e) =>
                    edit((d) => {
                      if (d.source?.sensor.kind === "ntc")
                        d.source.sensor.position = e.target.value as "top" | "bottom";
                    })
                  }
                >
                  <option value="bottom">at the bottom (input falls as it warms)</option>
                  <option value="top">at the top (input rises as it warms)</option>
                </SelectRow>
              </>
            ) : null}
            {sensor.kind === "linear" ? (
              <>
                <QuantityField
                  name="source.sensor.voltsPerUnit"
                  label="Volts per unit"
                  unit="V"
                  value={sensor.voltsPerUnit}
                  validate={(v) => (v !== 0 ? null : "must not be 0")}
                  disabled={readOnly}
                  onCommit={(v) =>
                    edit((d) => {
                      if (d.source?.sensor.kind === "linear") d.source.sensor.voltsPerUnit = v;
                    })
                  }
                />
                <QuantityField
                  name="source.sensor.offset"
                  label="Offset"
                  unit="V"
                  value={sensor.offset}
                  disabled={readOnly}
                  onCommit={(v) =>
                    edit((d) => {
                      if (d.source?.sensor.kind === "linear") d.source.sensor.offset = v;
                    })
                  }
                />
              </>
            ) : null}
            <TextRow
              label="Unit"
              name="source.unit"
              value={source.unit ?? ""}
              placeholder={sensor.kind === "divider" ? "V" : sensor.kind === "ntc" ? "°C" : (sensor.unit ?? "unit")}
              maxLength={20}
              disabled={readOnly}
              onCommit={(v) =>
                edit((d) => {
                  if (d.source) d.source.unit = v || undefined;
                })
              }
            />
            <Note>The input waveforms are in this unit; noise stays in volts at the stage input.</Note>
          </>
        ) : null}
      </Section>
      <Section title="Filter and output">
        {kind !== "relaxation-oscillator" ? (
          <SelectRow
            label="RC filter"
            name="filter"
            value={filter ? "on" : "off"}
            disabled={readOnly}
            onChange={(e) =>
              edit((d) => {
                if (e.target.value === "on") d.filter = { r: 10e3, c: 1e-6 };
                else delete d.filter;
              })
            }
          >
            <option value="off">none</option>
            <option value="on">low-pass before the stage input</option>
          </SelectRow>
        ) : null}
        {filter ? (
          <>
            <QuantityField
              name="filter.r"
              label="Filter resistor"
              unit="Ω"
              value={filter.r}
              validate={ohmsRule}
              disabled={readOnly}
              onCommit={(v) =>
                edit((d) => {
                  if (d.filter) d.filter.r = v;
                })
              }
            />
            <QuantityField
              name="filter.c"
              label="Filter capacitor"
              hint="stage input to 0 V"
              unit="F"
              value={filter.c}
              validate={(v) => (v > 0 && v <= 1 ? null : "between 0 and 1 F")}
              disabled={readOnly}
              onCommit={(v) =>
                edit((d) => {
                  if (d.filter) d.filter.c = v;
                })
              }
            />
            <Note>Time constant {(filter.r * filter.c).toPrecision(3)} s (plus the source resistance).</Note>
          </>
        ) : null}
        <SelectRow
          label="Output"
          name="output.kind"
          value={output?.kind ?? "push-pull"}
          disabled={readOnly}
          onChange={(e) =>
            edit((d) => {
              if (e.target.value === "open-drain") d.output = { kind: "open-drain", pullUp: 10e3 };
              else delete d.output;
            })
          }
        >
          <option value="push-pull">push-pull (drives both ways)</option>
          <option value="open-drain">open drain with a pull-up</option>
        </SelectRow>
        {output?.kind === "open-drain" ? (
          <>
            <QuantityField
              name="output.pullUp"
              label="Pull-up"
              unit="Ω"
              value={output.pullUp}
              validate={ohmsRule}
              disabled={readOnly}
              onCommit={(v) =>
                edit((d) => {
                  if (d.output?.kind === "open-drain") d.output.pullUp = v;
                })
              }
            />
            <QuantityField
              name="output.pullUpTo"
              label="Pull-up to"
              unit="V"
              placeholder="positive supply"
              value={typeof output.pullUpTo === "number" ? output.pullUpTo : undefined}
              disabled={readOnly}
              onClear={() =>
                edit((d) => {
                  if (d.output?.kind === "open-drain") delete d.output.pullUpTo;
                })
              }
              onCommit={(v) =>
                edit((d) => {
                  if (d.output?.kind === "open-drain") d.output.pullUpTo = v;
                })
              }
            />
          </>
        ) : null}
      </Section>
    </>
  );
}
