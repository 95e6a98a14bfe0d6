// Read-only view of a railwise.scenario/1 document: stage, supplies, part profile, input and
// run settings in engineering units. Used on the scenario page for every role and by the
// workbench for read-only members. Server- and client-safe (no hooks).
import type { ReactNode } from "react";
import { Card } from "@/components/ui/card";
import { KeyValueTable, Table, TBody, TD, TH, THead, TR, type KeyValueRow } from "@/components/ui/table";
import { Badge } from "@/components/ui/badge";
import { formatQuantity, formatRkm } from "@/lib/design/notation";
import { conditionsOf, stageFigures } from "@/lib/design/analysis";
import { defaultInitialOutput } from "@/lib/sim/network";
import { scenarioSchema, type InputComponent, type Scenario, type ScenarioInput } from "@/lib/schemas/scenario";
import {
  STAGE_KIND_LABEL,
  STAGE_ROLE_LABEL,
  STAGE_ROLE_ORDER,
  inputWhere,
  roleWhere,
  type StageRole,
} from "@/lib/workbench/stage-labels";
import { contentKeys } from "@/lib/workbench/row-ids";

const q = (v: number, unit: string, digits = 4) => formatQuantity(v, unit, digits);
const volts = (v: number) => q(v, "V");
const seconds = (v: number) => q(v, "s");
const percent = (v: number) => `${Number((v * 100).toPrecision(3))} %`;

export interface ScenarioTablesProps {
  /** Parsed (defaults applied) or stored scenario; optional fields may be absent. */
  scenario: Scenario | ScenarioInput;
}

export function ScenarioTables({ scenario }: ScenarioTablesProps) {
  return (
    <div className="grid gap-4 lg:grid-cols-2" data-testid="scenario-tables">
      <StageTable scenario={scenario} />
      <SupplyTable scenario={scenario} />
      <PartProfileTable scenario={scenario} />
      <RunTable scenario={scenario} />
      <div className="lg:col-span-2">
        <InputTable scenario={scenario} />
      </div>
    </div>
  );
}

export function StageTable({ scenario }: ScenarioTablesProps) {
  const stage = scenario.stage as Record<string, unknown> & { kind: Scenario["stage"]["kind"] };
  const rows: KeyValueRow[] = [
    {
      label: "Input enters",
      value: (
        <span className="font-sans">
          {inputWhere(stage.kind, stage.inputAt === "inverting" ? "inverting" : "noninverting")}
        </span>
      ),
    },
  ];
  for (const role of STAGE_ROLE_ORDER) {
    const v = stage[role];
    if (typeof v !== "number") continue;
    rows.push({
      label: <RoleLabel role={role} where={roleWhere(stage.kind, role)} />,
      value: role === "cTiming" ? q(v, "F") : q(v, "Ω"),
      note: role === "cTiming" ? undefined : formatRkm(v),
    });
  }
  rows.push({ label: "Reference", value: volts(typeof stage.reference === "number" ? stage.reference : 0) });
  rows.push(...designedFigureRows(scenario));
  return (
    <Card title="Stage" actions={<Badge tone="indigo">{STAGE_KIND_LABEL[stage.kind] ?? stage.kind}</Badge>}>
      <KeyValueTable rows={rows} caption="Stage parts" />
    </Card>
  );
}

function RoleLabel({ role, where }: { role: StageRole; where: string }) {
  return (
    <span className="flex flex-col">
      <span>{STAGE_ROLE_LABEL[role].name}</span>
      <span className="text-[11px] leading-tight text-ink-faint">{where}</span>
    </span>
  );
}

/**
 * What the stage is designed to do, from lib/design's closed forms with this part's output
 * limits, offset and open-loop gain: switching points and deadband, gain, or frequency.
 */
function designedFigureRows(scenario: Scenario | ScenarioInput): KeyValueRow[] {
  const parsed = scenarioSchema.safeParse(scenario);
  if (!parsed.success) return [];
  const { stage, opamp, supply } = parsed.data;
  const f = stageFigures(stage, conditionsOf(opamp, supply));
  const note = "designed";
  const rows: KeyValueRow[] = [];
  if (f.upperThreshold !== null && f.lowerThreshold !== null) {
    if (f.hysteresis !== null && f.hysteresis > 0) {
      rows.push(
        { label: "Upper switching point", value: q(f.upperThreshold, "V"), note },
        { label: "Lower switching point", value: q(f.lowerThreshold, "V"), note },
        // Deadband / 6.6 = largest Gaussian noise rms that stays inside it peak-to-peak (common practice, no source).
        { label: "Deadband", value: q(f.hysteresis, "V"), note: `noise below ${q(f.hysteresis / 6.6, "V", 2)} rms` },
      );
    } else {
      rows.push({ label: "Switching point", value: q(f.upperThreshold, "V"), note: "designed, no deadband" });
    }
  }
  if (f.gain !== null) rows.push({ label: "Closed-loop gain", value: `${num(f.gain)} V/V`, note });
  if (f.frequency !== null) rows.push({ label: "Frequency", value: q(f.frequency, "Hz"), note });
  if (f.dutyCycle !== null) rows.push({ label: "Duty cycle", value: percent(f.dutyCycle), note });
  return rows;
}

export function SupplyTable({ scenario }: ScenarioTablesProps) {
  const { supply, opamp } = scenario;
  const high = supply.positive - opamp.outputHeadroomHigh;
  const low = supply.negative + opamp.outputHeadroomLow;
  return (
    <Card title="Supplies">
      <KeyValueTable
        caption="Supplies and output limits"
        rows={[
          { label: "Positive rail (V+)", value: volts(supply.positive) },
          { label: "Negative rail (V−)", value: volts(supply.negative) },
          { label: "Span", value: volts(supply.positive - supply.negative) },
          { label: "Output high limit", value: volts(high), note: "V+ − headroom" },
          { label: "Output low limit", value: volts(low), note: "V− + headroom" },
        ]}
      />
    </Card>
  );
}

export function PartProfileTable({ scenario }: ScenarioTablesProps) {
  const o = scenario.opamp;
  const rows: KeyValueRow[] = [
    // Not "100 kV/V": a prefix on a ratio reads like kilovolts.
    {
      label: "Open-loop gain",
      value: `${Math.round(o.openLoopGain).toLocaleString("en-US")} V/V`,
      note: `${(20 * Math.log10(o.openLoopGain)).toFixed(0)} dB`,
    },
    { label: "Gain-bandwidth", value: q(o.gainBandwidth, "Hz") },
    {
      label: "Slew rate",
      value: `${num(o.slewRate / 1e6)} V/µs`,
      note: o.slewRateFall === undefined ? "both edges" : "rising",
    },
  ];
  if (o.slewRateFall !== undefined)
    rows.push({ label: "Slew rate, falling", value: `${num(o.slewRateFall / 1e6)} V/µs` });
  rows.push(
    { label: "Headroom to V+", value: volts(o.outputHeadroomHigh) },
    { label: "Headroom to V−", value: volts(o.outputHeadroomLow) },
    { label: "Input offset", value: `${num(o.inputOffset * 1e3)} mV` },
  );
  if (o.propagationDelay !== undefined) rows.push({ label: "Propagation delay", value: seconds(o.propagationDelay) });
  return (
    <Card title="Part profile" description="Behavioural op-amp parameters">
      <KeyValueTable rows={rows} caption="Part profile" />
    </Card>
  );
}

export function RunTable({ scenario }: ScenarioTablesProps) {
  const r = scenario.run;
  const rows: KeyValueRow[] = [
    { label: "Duration", value: seconds(r.duration) },
    { label: "Output points", value: r.points.toLocaleString("en-US") },
    { label: "Sample interval", value: seconds(r.duration / Math.max(1, r.points - 1)) },
    // Absent → the simulator's rule: "settled" for amplifiers, "low" for the other kinds.
    { label: "Output at start", value: r.initialOutput ?? `${defaultInitialOutput(scenario.stage.kind)} (default)` },
  ];
  if (r.holdOff !== undefined) rows.push({ label: "Chatter hold-off", value: seconds(r.holdOff) });
  if (r.solver !== undefined) rows.push({ label: "Solver", value: r.solver });
  return (
    <Card title="Run settings">
      <KeyValueTable rows={rows} caption="Run settings" />
    </Card>
  );
}

export function InputTable({ scenario }: ScenarioTablesProps) {
  const { components, noise } = scenario.input;
  // Read-only rows: each keys on its kind and parameters.
  const params = components.map((c) => componentParams(c as InputComponent));
  const keys = contentKeys(components, (c, k) => `${c.kind}:${JSON.stringify(params[k])}`);
  return (
    <Card title="Input signal" description="Sum of the components below, plus noise" padded={false}>
      <Table>
        <THead>
          <TR>
            <TH className="w-10">#</TH>
            <TH className="w-28">Waveform</TH>
            <TH>Parameters</TH>
          </TR>
        </THead>
        <TBody>
          {components.map((c, i) => (
            <TR key={keys[i]}>
              <TD className="font-mono text-ink-mute">{i + 1}</TD>
              <TD className="font-medium">{COMPONENT_LABEL[c.kind]}</TD>
              <TD>
                <ParamList items={params[i]} />
              </TD>
            </TR>
          ))}
          <TR>
            <TD className="font-mono text-ink-mute">~</TD>
            <TD className="font-medium">Noise</TD>
            <TD>
              {noise && noise.rms > 0 ? (
                <ParamList
                  items={[
                    ["rms", volts(noise.rms)],
                    ["≈ peak-to-peak (6.6 × rms)", volts(6.6 * noise.rms)],
                    ["bandwidth", q(noise.bandwidth, "Hz")],
                    ["seed", String(noise.seed)],
                  ]}
                />
              ) : (
                <span className="text-ink-mute">none</span>
              )}
            </TD>
          </TR>
        </TBody>
      </Table>
    </Card>
  );
}

const COMPONENT_LABEL: Record<InputComponent["kind"], string> = {
  dc: "DC level",
  sine: "Sine",
  triangle: "Triangle",
  ramp: "Ramp",
  pulse: "Pulse",
  pwl: "Point list",
  capture: "Capture",
};

type Param = [label: string, value: string];

function componentParams(c: InputComponent): Param[] {
  switch (c.kind) {
    case "dc":
      return [["level", volts(c.level)]];
    case "sine":
    case "triangle": {
      const out: Param[] = [
        ["amplitude", volts(c.amplitude)],
        ["frequency", q(c.frequency, "Hz")],
      ];
      if (c.offset) out.push(["offset", volts(c.offset)]);
      if (c.phase) out.push(["phase", `${num(c.phase)}°`]);
      return out;
    }
    case "ramp":
      return [
        ["from", volts(c.from)],
        ["to", volts(c.to)],
        ["starts at", seconds(c.start)],
        ["over", seconds(c.duration)],
      ];
    case "pulse": {
      const out: Param[] = [
        ["low", volts(c.low)],
        ["high", volts(c.high)],
        ["period", seconds(c.period)],
        ["duty", percent(c.duty)],
      ];
      if (c.rise) out.push(["rise", seconds(c.rise)]);
      if (c.fall) out.push(["fall", seconds(c.fall)]);
      if (c.delay) out.push(["delay", seconds(c.delay)]);
      return out;
    }
    case "pwl":
      return pointsParams(c.points, "points");
    case "capture":
      return pointsParams(c.samples, "samples");
  }
}

function pointsParams(points: [number, number][], noun: string): Param[] {
  if (points.length === 0) return [[noun, "0"]];
  let lo = Infinity;
  let hi = -Infinity;
  for (const [, v] of points) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [
    [noun, points.length.toLocaleString("en-US")],
    ["time", `${seconds(points[0][0])} … ${seconds(points[points.length - 1][0])}`],
    ["values", `${volts(lo)} … ${volts(hi)}`],
  ];
}

function ParamList({ items }: { items: Param[] }): ReactNode {
  return (
    <dl className="flex flex-wrap gap-x-4 gap-y-1">
      {items.map(([label, value]) => (
        <div key={label} className="flex items-baseline gap-1.5">
          <dt className="text-[12px] text-ink-mute">{label}</dt>
          <dd className="font-mono whitespace-nowrap text-ink">{value}</dd>
        </div>
      ))}
    </dl>
  );
}

/** Up to 4 significant figures without float noise (0.30000000000000004 → 0.3). */
function num(v: number): string {
  return String(Number(v.toPrecision(4)));
}
