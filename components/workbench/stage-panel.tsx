"use client";
// "Stage": the network (kind, resistor roles, capacitor, reference), the supplies and the op-amp
// part profile with per-scenario overrides, above a diagram generated from the numbers.
import useSWR from "swr";
import type { OpAmp, StageKind } from "@/lib/schemas/scenario";
import { STAGE_KINDS } from "@/lib/schemas/scenario";
import { OPAMP_PARAMS, OPAMP_PARAM_INFO, type OpampParam } from "@/lib/schemas/part";
import { DEMO_PART_PROFILES } from "@/lib/demo/parts";
import { fetchJson } from "@/lib/client/fetcher";
import { STAGE_KIND_LABEL, STAGE_ROLE_LABEL } from "@/lib/workbench/stage-labels";
import { QuantityField } from "./quantity-field";
import { Section, SelectRow, MiniButton } from "./controls";
import { StageDiagram } from "./stage-diagram";
import { KIND_INFO, roleValue, stageRoles, switchStageKind, type ResistorRole } from "@/lib/workbench/stage-kinds";
import { useWb, useWbShallow } from "./store";
import { CircuitSections, ReferenceSection, syncReferenceDivider } from "@/components/circuit/circuit-sections";
import { OPAMP_LABEL } from "@/lib/workbench/screen-words";

export interface PartOption {
  id: string;
  name: string;
  opamp: OpAmp;
  source: "team" | "demo";
}

const DEMO_OPTIONS: PartOption[] = DEMO_PART_PROFILES.map((p, i) => ({
  id: `demo-${i}`,
  name: p.name,
  opamp: p.params,
  source: "demo",
}));

/** The team library, or the generic demo profiles when the library cannot be read. */
export function usePartOptions(): { options: PartOption[]; fromTeam: boolean } {
  const { data, error } = useSWR<{ items: { id: string; name: string; opamp?: OpAmp; params?: OpAmp }[] }>(
    "/api/parts",
    (u: string) => fetchJson(u),
    {
      revalidateOnFocus: false,
      shouldRetryOnError: false,
    },
  );
  if (error || !data?.items?.length) return { options: DEMO_OPTIONS, fromTeam: false };
  const options = data.items
    .map((p) => ({ id: p.id, name: p.name, opamp: (p.opamp ?? p.params) as OpAmp, source: "team" as const }))
    .filter((p) => p.opamp);
  return { options: options.length ? options : DEMO_OPTIONS, fromTeam: options.length > 0 };
}

function sameOpamp(a: OpAmp, b: OpAmp): boolean {
  return OPAMP_PARAMS.every((k) => (a[k] ?? null) === (b[k] ?? null));
}

const ohmsRule = (v: number) => (v > 0 ? (v <= 1e12 ? null : "at most 1 TΩ") : "must be above 0");

export function StagePanel({ readOnly = false }: { readOnly?: boolean }) {
  const stage = useWb((s) => s.draft.stage);
  const supply = useWbShallow((s) => s.draft.supply);
  const source = useWb((s) => s.draft.source);
  const filter = useWb((s) => s.draft.filter);
  const output = useWb((s) => s.draft.output);
  const edit = useWb((s) => s.edit);
  const info = KIND_INFO[stage.kind];

  return (
    <div data-testid="stage-panel">
      <div className="border-b border-paper-line bg-white px-2 py-2">
        <StageDiagram scenario={{ stage, supply, source, filter, output }} />
      </div>
      <Section title="Network">
        <SelectRow
          label="Kind"
          name="stage.kind"
          value={stage.kind}
          disabled={readOnly}
          onChange={(e) => {
            const kind = e.target.value as StageKind;
            edit((d) => {
              d.stage = switchStageKind(d.stage, kind);
            });
          }}
        >
          {STAGE_KINDS.map((k) => (
            <option key={k} value={k}>
              {STAGE_KIND_LABEL[k]}
            </option>
          ))}
        </SelectRow>
        <p className="mb-1 sm:ml-[8rem] text-[11.5px] leading-snug text-ink-mute">{info.blurb}</p>
        {stage.kind === "comparator" ? (
          <SelectRow
            label="Input on"
            name="stage.inputAt"
            value={stage.inputAt}
            disabled={readOnly}
            onChange={(e) =>
              edit((d) => {
                if (d.stage.kind === "comparator") d.stage.inputAt = e.target.value as "noninverting" | "inverting";
              })
            }
          >
            <option value="noninverting">v+ (output rises with the input)</option>
            <option value="inverting">v− (output falls as the input rises)</option>
          </SelectRow>
        ) : null}
        {stageRoles(stage)
          // With a reference divider, rReference is the divider itself (edited below).
          .filter((role: ResistorRole) => !(stage.referenceDivider && role === "rReference"))
          .map((role: ResistorRole) => (
            <QuantityField
              key={`${stage.kind}-${role}`}
              name={`stage.${role}`}
              label={STAGE_ROLE_LABEL[role].name}
              hint={STAGE_ROLE_LABEL[role].between}
              unit="Ω"
              value={roleValue(stage, role) ?? 0}
              validate={ohmsRule}
              disabled={readOnly}
              onCommit={(v) =>
                edit((d) => {
                  (d.stage as unknown as Record<string, number>)[role] = v;
                })
              }
            />
          ))}
        {stage.kind === "relaxation-oscillator" ? (
          <QuantityField
            name="stage.cTiming"
            label={STAGE_ROLE_LABEL.cTiming.name}
            hint={STAGE_ROLE_LABEL.cTiming.between}
            unit="F"
            value={stage.cTiming}
            validate={(v) => (v > 0 && v <= 1 ? null : "between 0 and 1 F")}
            disabled={readOnly}
            onCommit={(v) =>
              edit((d) => {
                if (d.stage.kind === "relaxation-oscillator") d.stage.cTiming = v;
              })
            }
          />
        ) : null}
        <ReferenceSection readOnly={readOnly} />
        {stage.referenceDivider ? null : (
          <QuantityField
            name="stage.reference"
            label="Reference"
            unit="V"
            value={stage.reference}
            disabled={readOnly}
            validate={(v) => (v >= supply.negative && v <= supply.positive ? null : "outside the supplies")}
            onCommit={(v) =>
              edit((d) => {
                d.stage.reference = v;
              })
            }
          />
        )}
      </Section>
      <CircuitSections readOnly={readOnly} />
      <Section title="Supplies">
        <QuantityField
          name="supply.positive"
          label="V+"
          unit="V"
          value={supply.positive}
          disabled={readOnly}
          validate={(v) => (v > supply.negative ? null : "must be above V−")}
          onCommit={(v) =>
            edit((d) => {
              d.supply.positive = v;
              syncReferenceDivider(d); // a divider from the supply follows it
            })
          }
        />
        <QuantityField
          name="supply.negative"
          label="V−"
          unit="V"
          value={supply.negative}
          disabled={readOnly}
          validate={(v) => (v < supply.positive ? null : "must be below V+")}
          onCommit={(v) =>
            edit((d) => {
              d.supply.negative = v;
              syncReferenceDivider(d); // a divider from the supply follows it
            })
          }
        />
      </Section>
      <PartSection readOnly={readOnly} />
    </div>
  );
}

const perMicro = (v: number) => `${Number((v / 1e6).toPrecision(4))} V/µs`;

const PARAM_DISPLAY: Record<
  OpampParam,
  { label: string; unit: string; rule?: (v: number) => string | null; show?: (v: number) => string }
> = {
  openLoopGain: { label: OPAMP_LABEL.openLoopGain, unit: "V/V", rule: (v) => (v >= 1 ? null : "at least 1") },
  gainBandwidth: { label: OPAMP_LABEL.gainBandwidth, unit: "Hz", rule: (v) => (v > 0 ? null : "must be above 0") },
  slewRate: {
    label: OPAMP_LABEL.slewRate,
    unit: "V/s",
    rule: (v) => (v > 0 ? null : "must be above 0"),
    show: perMicro,
  },
  slewRateFall: {
    label: OPAMP_LABEL.slewRateFall,
    unit: "V/s",
    rule: (v) => (v > 0 ? null : "must be above 0"),
    show: perMicro,
  },
  outputHeadroomHigh: {
    label: OPAMP_LABEL.outputHeadroomHigh,
    unit: "V",
    rule: (v) => (v >= 0 ? null : "not negative"),
  },
  outputHeadroomLow: { label: OPAMP_LABEL.outputHeadroomLow, unit: "V", rule: (v) => (v >= 0 ? null : "not negative") },
  inputOffset: { label: OPAMP_LABEL.inputOffset, unit: "V", rule: (v) => (Math.abs(v) <= 1 ? null : "within ±1 V") },
  propagationDelay: {
    label: OPAMP_LABEL.propagationDelay,
    unit: "s",
    rule: (v) => (v >= 0 && v <= 1 ? null : "0 … 1 s"),
  },
};

function PartSection({ readOnly }: { readOnly: boolean }) {
  const opamp = useWb((s) => s.draft.opamp);
  const partName = useWb((s) => s.partName);
  const setPartName = useWb((s) => s.setPartName);
  const edit = useWb((s) => s.edit);
  const { options, fromTeam } = usePartOptions();
  const exact = options.find((p) => sameOpamp(p.opamp, opamp));
  const base = exact ?? options.find((p) => p.name === partName) ?? null;
  const changed = base ? OPAMP_PARAMS.filter((k) => (base.opamp[k] ?? null) !== (opamp[k] ?? null)) : [];

  return (
    <Section
      title="Op-amp part profile"
      aside={<span className="text-[11px] text-ink-faint">{fromTeam ? "team library" : "demo profiles"}</span>}
    >
      <SelectRow
        label="Profile"
        name="part"
        value={base?.id ?? ""}
        disabled={readOnly}
        onChange={(e) => {
          const p = options.find((o) => o.id === e.target.value);
          if (!p) return;
          setPartName(p.name);
          edit((d) => {
            d.opamp = { ...p.opamp };
          });
        }}
      >
        {!base ? <option value="">custom values</option> : null}
        {options.map((p) => (
          <option key={p.id} value={p.id}>
            {p.name}
          </option>
        ))}
      </SelectRow>
      <p className="mb-1 sm:ml-[8rem] text-[11.5px] text-ink-mute">
        {base && changed.length ? (
          <>
            Overridden here:{" "}
            <span className="text-copper-deep">{changed.map((k) => PARAM_DISPLAY[k].label).join(", ")}</span>
            {!readOnly ? (
              <MiniButton
                className="ml-2"
                onClick={() =>
                  edit((d) => {
                    d.opamp = { ...base.opamp };
                  })
                }
              >
                Back to profile
              </MiniButton>
            ) : null}
          </>
        ) : base ? (
          "Profile values; edit any field to override it for this scenario only."
        ) : (
          "Values do not match a library profile."
        )}
      </p>
      {OPAMP_PARAMS.map((k) => {
        const d = PARAM_DISPLAY[k];
        const optional = OPAMP_PARAM_INFO[k].optional;
        const overridden = changed.includes(k);
        return (
          <QuantityField
            key={k}
            name={`opamp.${k}`}
            label={overridden ? `${d.label} •` : d.label}
            unit={d.unit}
            value={opamp[k]}
            validate={d.rule}
            display={d.show}
            disabled={readOnly}
            placeholder={optional ? (k === "slewRateFall" ? "same as ↑" : "none") : undefined}
            onClear={
              optional
                ? () =>
                    edit((dr) => {
                      delete dr.opamp[k];
                    })
                : undefined
            }
            onCommit={(v) =>
              edit((dr) => {
                dr.opamp[k] = v;
              })
            }
          />
        );
      })}
    </Section>
  );
}
