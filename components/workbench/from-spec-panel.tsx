"use client";
// "From spec": switching points, gain or frequency in; E-series parts, achieved and worst-case
// figures out (lib/design), shown before anything touches the stage. Thresholds may be given
// as input volts, as battery volts through a divider, or as temperatures through an NTC divider.
import { useMemo, useState } from "react";
import type { StageKind } from "@/lib/schemas/scenario";
import { STAGE_KINDS } from "@/lib/schemas/scenario";
import { design, type DesignResult } from "@/lib/design";
import { SERIES_NAMES, SERIES_TOLERANCE, type SeriesName } from "@/lib/design/eseries";
import { formatQuantity } from "@/lib/design/notation";
import { STAGE_KIND_LABEL, STAGE_ROLE_LABEL } from "@/lib/workbench/stage-labels";
import { Button } from "@/components/ui/button";
import { QuantityField } from "./quantity-field";
import { MiniButton, Section, SelectRow } from "./controls";
import { useWb, useWbApi } from "./store";
import { refuseIfInvalid } from "./field-problems";
import { designWarningText } from "@/lib/workbench/design-words";
import { frontEndOf, sensorToInput, type SensorSetup, SensorFields } from "./spec-sensors";
import { sensorOfSetup, specSeed, type SpecForm } from "@/lib/workbench/spec-seed";
import type { DesignSpecInput } from "@/lib/schemas/design";

type TargetMode = "thresholds" | "threshold" | "gain" | "frequency";

function targetMode(kind: StageKind): TargetMode {
  if (kind === "schmitt-inverting" || kind === "schmitt-noninverting") return "thresholds";
  if (kind === "comparator") return "threshold";
  if (kind === "relaxation-oscillator") return "frequency";
  return "gain";
}

type Form = SpecForm;

const fmtV = (v: number | null | undefined, unit = "V") =>
  v == null || !Number.isFinite(v) ? "—" : formatQuantity(v, unit, 4);

export function FromSpecPanel() {
  const draft = useWb((s) => s.draft);
  const edit = useWb((s) => s.edit);
  const api = useWbApi();
  // Reopening a scenario designed from a spec shows that spec, not the defaults.
  const [seed] = useState(() => specSeed(draft));
  const [form, setForm] = useState<Form>(seed.form);
  const [sensor, setSensor] = useState<SensorSetup>(seed.sensor);
  const [storedSpec, setStoredSpec] = useState<DesignSpecInput | null>(null);
  const [result, setResult] = useState<DesignResult | null>(null);
  const [problem, setProblem] = useState<string[] | null>(null);
  const set =
    <K extends keyof Form>(k: K) =>
    (v: Form[K]) => {
      setForm((f) => ({ ...f, [k]: v }));
      setResult(null);
    };
  const mode = targetMode(form.kind);
  const usesSensor = mode === "thresholds" || mode === "threshold";

  // Thresholds in sensor units → input volts, through the chosen sensor chain.
  const mapped = useMemo(() => {
    if (!usesSensor) return null;
    try {
      const fe = frontEndOf(sensor);
      // Self-heating of an NTC at the warmer threshold (lib/design/sensors.ts, δ = 1 mW/K).
      const heat = fe?.selfHeating ? fe.selfHeating(Math.max(form.upper, form.lower)) : null;
      return {
        upper: sensorToInput(sensor, form.upper),
        lower: sensorToInput(sensor, form.lower),
        threshold: sensorToInput(sensor, form.threshold),
        inverted: fe?.inverted ?? false,
        heat,
        error: null as string | null,
      };
    } catch (e) {
      return {
        upper: NaN,
        lower: NaN,
        threshold: NaN,
        inverted: false,
        heat: null,
        error: e instanceof Error ? e.message : String(e),
      };
    }
  }, [sensor, form.upper, form.lower, form.threshold, usesSensor]);

  const specInvalid = useWb((s) => Object.values(s.fieldProblems).some((p) => p.scope === "spec"));

  const run = () => {
    setProblem(null);
    setResult(null);
    if (refuseIfInvalid(api, ["spec"], "Find parts")) return;
    let target: Record<string, number> = {};
    if (mode === "thresholds" && mapped) {
      // A sensor that falls as the quantity rises (NTC at the bottom) swaps the two points.
      target = {
        upperThreshold: Math.max(mapped.upper, mapped.lower),
        lowerThreshold: Math.min(mapped.upper, mapped.lower),
      };
    } else if (mode === "threshold" && mapped) target = { threshold: mapped.threshold };
    else if (mode === "gain") target = { gain: form.gain };
    else if (mode === "frequency")
      target = form.duty ? { frequency: form.frequency, duty: form.duty } : { frequency: form.frequency };
    const spec = {
      schema: "railwise.design-spec/1",
      kind: form.kind,
      supply: draft.supply,
      opamp: draft.opamp,
      target,
      series: form.series,
      tolerance: form.tolerancePct / 100,
      reference: form.referenceAuto ? "auto" : form.reference,
      ...(form.kind === "comparator" ? { inputAt: form.inputAt } : {}),
      monteCarlo: false,
    };
    // Stored with the scenario on Apply: thresholds in the sensor's units with the sensor itself.
    const chain = usesSensor ? sensorOfSetup(sensor) : null;
    const keep = {
      ...spec,
      ...(chain
        ? {
            sensor: chain,
            target:
              mode === "thresholds"
                ? { upperThreshold: form.upper, lowerThreshold: form.lower }
                : { threshold: form.threshold },
          }
        : {}),
    } as DesignSpecInput;
    try {
      setResult(design(spec));
      setStoredSpec(keep);
    } catch (e) {
      const issues = (e as { issues?: string[] }).issues;
      setProblem(Array.isArray(issues) && issues.length ? issues : [e instanceof Error ? e.message : String(e)]);
    }
  };

  const apply = () => {
    if (!result) return;
    if (refuseIfInvalid(api, ["spec"], "Apply to stage")) return;
    edit((d) => {
      d.stage = result.stage;
      if (storedSpec) d.spec = storedSpec as typeof d.spec;
    });
    api.getState().setNotice({
      tone: "ok",
      text: `Design applied to the stage (${result.parts.map((p) => `${p.ref} ${p.code}`).join(", ")}). Run to check it; Save to keep it.`,
    });
    api.getState().setTab("stage");
  };

  return (
    <div data-testid="from-spec-panel">
      <Section title="What the stage must do">
        {seed.from ? (
          <p className="mb-1.5 text-[11.5px] text-ink-mute" data-testid="spec-seeded">
            From the spec saved with this scenario: {seed.from}.
          </p>
        ) : null}
        <SelectRow
          label="Kind"
          value={form.kind}
          onChange={(e) => set("kind")(e.target.value as StageKind)}
          name="spec.kind"
        >
          {STAGE_KINDS.map((k) => (
            <option key={k} value={k}>
              {STAGE_KIND_LABEL[k]}
            </option>
          ))}
        </SelectRow>
        {usesSensor ? (
          <SensorFields
            sensor={sensor}
            onChange={(s) => {
              setSensor(s);
              setResult(null);
            }}
          />
        ) : null}
        {mode === "thresholds" ? (
          <>
            <QuantityField
              label={`Upper (${sensorUnitLabel(sensor)})`}
              name="spec.upper"
              unit={sensorUnit(sensor)}
              value={form.upper}
              onCommit={set("upper")}
              validate={(v) =>
                v > form.lower ? null : `must be above Lower (${formatQuantity(form.lower, sensorUnit(sensor), 4)})`
              }
            />
            <QuantityField
              label={`Lower (${sensorUnitLabel(sensor)})`}
              name="spec.lower"
              unit={sensorUnit(sensor)}
              value={form.lower}
              onCommit={set("lower")}
              validate={(v) =>
                v < form.upper ? null : `must be below Upper (${formatQuantity(form.upper, sensorUnit(sensor), 4)})`
              }
            />
          </>
        ) : null}
        {mode === "threshold" ? (
          <>
            <QuantityField
              label={`Switch at (${sensorUnitLabel(sensor)})`}
              name="spec.threshold"
              unit={sensorUnit(sensor)}
              value={form.threshold}
              onCommit={set("threshold")}
            />
            <SelectRow
              label="Input on"
              value={form.inputAt}
              onChange={(e) => set("inputAt")(e.target.value as Form["inputAt"])}
            >
              <option value="noninverting">v+</option>
              <option value="inverting">v−</option>
            </SelectRow>
          </>
        ) : null}
        {mapped && sensor.kind !== "volts" ? (
          <p className="ml-[8rem] text-[11.5px] text-ink-mute" data-testid="sensor-mapping">
            {mapped.error ? (
              <span className="text-alert">{mapped.error}</span>
            ) : mode === "thresholds" ? (
              <>
                At the stage input: upper {fmtV(Math.max(mapped.upper, mapped.lower))}, lower{" "}
                {fmtV(Math.min(mapped.upper, mapped.lower))}.
                {mapped.inverted
                  ? " Warmer means a lower voltage here: an over-temperature alarm switches on the falling input (the lower point)."
                  : ""}
                {mapped.heat
                  ? ` Self-heating ${(mapped.heat.power * 1e3).toFixed(2)} mW, ${mapped.heat.temperatureRise.toFixed(2)} K.`
                  : ""}
                {mapped.heat?.warning ? <span className="block text-caution">{mapped.heat.warning}</span> : null}
              </>
            ) : (
              <>At the stage input: {fmtV(mapped.threshold)}</>
            )}
          </p>
        ) : null}
        {mode === "gain" ? (
          <QuantityField
            label="Gain"
            name="spec.gain"
            unit="V/V"
            value={form.gain}
            onCommit={set("gain")}
            hint={form.kind === "inverting-amplifier" ? "negative" : "≥ 1"}
          />
        ) : null}
        {mode === "frequency" ? (
          <>
            <QuantityField
              label="Frequency"
              name="spec.frequency"
              unit="Hz"
              value={form.frequency}
              onCommit={set("frequency")}
              validate={(v) => (v > 0 ? null : "must be above 0")}
            />
            <QuantityField
              label="Duty (0…1)"
              name="spec.duty"
              unit=""
              value={form.duty}
              placeholder="free"
              onClear={() => set("duty")(undefined)}
              onCommit={set("duty")}
            />
          </>
        ) : null}
      </Section>
      <Section title="Parts">
        <SelectRow
          label="Series"
          value={form.series}
          onChange={(e) => {
            const s = e.target.value as SeriesName;
            setForm((f) => ({ ...f, series: s, tolerancePct: 100 * SERIES_TOLERANCE[s] }));
            setResult(null);
          }}
        >
          {SERIES_NAMES.map((s) => (
            <option key={s} value={s}>
              {s} ({(100 * SERIES_TOLERANCE[s]).toString()} % usual)
            </option>
          ))}
        </SelectRow>
        <QuantityField
          label="Tolerance (%)"
          name="spec.tolerance"
          unit="%"
          plain
          value={form.tolerancePct}
          onCommit={set("tolerancePct")}
          validate={(v) => (v >= 0 && v <= 20 ? null : "0 … 20 %")}
        />
        {mode !== "gain" ? (
          <>
            <label className="grid grid-cols-[7.5rem_minmax(0,1fr)] items-center gap-x-2 py-0.5 text-[13px]">
              <span className="text-ink-soft">Reference</span>
              <span className="flex items-center gap-1.5 text-ink-soft">
                <input
                  type="checkbox"
                  checked={form.referenceAuto}
                  onChange={(e) => set("referenceAuto")(e.target.checked)}
                />
                divider from the supply (choose it for me)
              </span>
            </label>
            {!form.referenceAuto ? (
              <QuantityField
                label="Reference"
                name="spec.reference"
                unit="V"
                value={form.reference}
                onCommit={set("reference")}
              />
            ) : null}
          </>
        ) : null}
        <p className="mb-1 mt-1 text-[11.5px] text-ink-mute">
          Supplies and part profile come from the Stage tab: {formatQuantity(draft.supply.negative, "V")} …{" "}
          {formatQuantity(draft.supply.positive, "V")}, offset {formatQuantity(draft.opamp.inputOffset, "V")}.
        </p>
        <div className="flex gap-2">
          <Button size="sm" variant="secondary" onClick={run} data-testid="design-button">
            Find parts
          </Button>
        </div>
        {problem ? (
          <ul
            className="mt-2 space-y-0.5 rounded border-l-[3px] border-alert bg-alert-soft/60 px-2 py-1 text-[12.5px]"
            role="alert"
          >
            {problem.map((p) => (
              <li key={p}>{p}</li>
            ))}
          </ul>
        ) : null}
      </Section>
      {result ? <DesignResultView result={result} onApply={apply} outOfDate={specInvalid} /> : null}
    </div>
  );
}

function sensorUnit(s: SensorSetup): string {
  return s.kind === "ntc" ? "°C" : "V";
}
function sensorUnitLabel(s: SensorSetup): string {
  // Short enough for the 120 px label column ("V at the source" is cut off there).
  return s.kind === "ntc" ? "°C" : s.kind === "divider" ? "source V" : "V";
}

const FIGURES: { key: keyof DesignResult["achieved"]; label: string; unit: string; scale?: number }[] = [
  { key: "upperThreshold", label: "Upper switching point", unit: "V" },
  { key: "lowerThreshold", label: "Lower switching point", unit: "V" },
  { key: "hysteresis", label: "Deadband", unit: "V" },
  { key: "gain", label: "Gain", unit: "V/V" },
  { key: "frequency", label: "Frequency", unit: "Hz" },
  { key: "dutyCycle", label: "Duty cycle", unit: "" },
];

function DesignResultView({
  result,
  onApply,
  outOfDate,
}: {
  result: DesignResult;
  onApply: () => void;
  outOfDate: boolean;
}) {
  const rows = FIGURES.filter((f) => result.achieved[f.key] != null);
  const show = (v: number | null | undefined, unit: string) =>
    unit ? fmtV(v, unit) : v == null ? "—" : `${(100 * v).toFixed(1)} %`;
  return (
    <Section
      title="Proposal"
      aside={
        <MiniButton
          onClick={onApply}
          disabled={outOfDate}
          title={
            outOfDate ? "Out of date: a spec field above is invalid. Fix it and press Find parts again." : undefined
          }
          className="border-copper text-copper-deep"
          data-testid="apply-design"
        >
          Apply to stage
        </MiniButton>
      }
    >
      {outOfDate ? (
        <p
          className="mb-1.5 rounded border-l-[3px] border-caution bg-caution-soft/70 px-2 py-1 text-[12px]"
          data-testid="proposal-out-of-date"
        >
          Out of date: a spec field above is invalid. Fix it and press Find parts again.
        </p>
      ) : null}
      <table className="mb-2 w-full border-collapse text-[12.5px]" data-testid="design-parts">
        <thead>
          <tr className="border-b border-paper-line text-left text-[11px] text-ink-mute">
            <th className="py-0.5 font-medium">part</th>
            <th className="py-0.5 font-medium">role</th>
            <th className="py-0.5 text-right font-medium">value</th>
          </tr>
        </thead>
        <tbody>
          {result.parts.map((p) => (
            <tr key={p.ref} className="border-b border-paper-line/60 last:border-0" title={p.note}>
              <td className="py-0.5 font-mono">{p.ref}</td>
              <td className="py-0.5 text-ink-soft">{partRoleName(p.role)}</td>
              <td className="py-0.5 text-right font-mono">
                {p.code}{" "}
                <span className="text-ink-faint">
                  {p.series} ±{(100 * p.tolerance).toFixed(p.tolerance < 0.01 ? 1 : 0)} %
                </span>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {result.reference.divider ? (
        <p className="mb-2 text-[11.5px] text-ink-mute">
          Reference {fmtV(result.reference.voltage)} from the divider; Apply puts the divider itself on the stage (its{" "}
          {formatQuantity(result.reference.divider.theveninResistance, "Ω", 4)} source resistance is part of the
          network).
        </p>
      ) : null}
      <dl className="divide-y divide-paper-line/70 text-[12.5px]" data-testid="design-figures">
        {rows.map((f) => {
          const w = result.worstCase[f.key];
          const err = result.errors[f.key];
          return (
            <div key={f.key} className="py-1">
              <div className="flex items-baseline justify-between gap-2">
                <dt className="text-ink-soft">{f.label}</dt>
                <dd className="whitespace-nowrap font-mono text-ink">{show(result.achieved[f.key], f.unit)}</dd>
              </div>
              <div className="flex items-baseline justify-between gap-2 text-[11.5px] text-ink-mute">
                <span className="whitespace-nowrap">
                  {err ? (
                    <>
                      target <span className="font-mono">{show(err.target, f.unit)}</span> ·{" "}
                      {err.relative >= 0 ? "+" : ""}
                      {(100 * err.relative).toFixed(2)} %
                    </>
                  ) : (
                    "no target"
                  )}
                </span>
                <span className="whitespace-nowrap font-mono">
                  {w ? `worst ${show(w[0], f.unit)} … ${show(w[1], f.unit)}` : "—"}
                </span>
              </div>
            </div>
          );
        })}
      </dl>
      <p className="mt-1 text-[11px] text-ink-faint">
        Worst case over resistor tolerance ±{(100 * result.assumptions.tolerance).toFixed(1)} %, offset ±
        {formatQuantity(result.assumptions.inputOffset, "V")} and ±
        {(100 * result.assumptions.headroomSpread).toFixed(0)} % output headroom.
      </p>
      {result.warnings.length ? (
        <ul className="mt-2 space-y-1">
          {result.warnings.map((w) => (
            <li key={w} className="rounded border-l-[3px] border-caution bg-caution-soft/60 px-2 py-1 text-[12px]">
              {designWarningText(w)}
            </li>
          ))}
        </ul>
      ) : null}
    </Section>
  );
}

/** Plain names of every part role lib/design proposes (stage, reference divider, sensor chain, output, filter). */
const PART_ROLE_NAME: Record<string, string> = {
  rTop: "Reference divider top",
  rBottom: "Reference divider bottom",
  sourceTop: "Sensor divider top",
  sourceBottom: "Sensor divider bottom",
  sourceFixed: "Fixed resistor beside the NTC",
  pullUp: "Output pull-up",
  filterR: "Filter resistor",
  filterC: "Filter capacitor",
};

export function partRoleName(role: string): string {
  if (role in STAGE_ROLE_LABEL) return STAGE_ROLE_LABEL[role as keyof typeof STAGE_ROLE_LABEL].name;
  return PART_ROLE_NAME[role] ?? role;
}
