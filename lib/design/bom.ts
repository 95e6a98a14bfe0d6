// Parts list of a scenario (lib/schemas/README.md § The circuit as built): every resistor and capacitor of
// the source, filter, stage, reference divider and output, derived from the scenario itself, each
// with its ref, role, value, RKM code, series and tolerance. A value outside every IEC 60063
// series is never listed as a part to buy without a warning. Pure TypeScript.
import { DEFAULT_TOLERANCES, type Scenario, type ScenarioInput } from "@/lib/schemas/scenario";
import { SERIES_NAMES, seriesValues, type SeriesName } from "./eseries";
import { formatQuantity, formatRkm } from "./notation";

export type BomGroup = "source" | "filter" | "stage" | "reference" | "output";

export interface BomLine {
  ref: string;
  kind: "resistor" | "capacitor" | "thermistor";
  group: BomGroup;
  /** Field in the scenario, e.g. "stage.rFeedback", "source.sensor.rFixed". */
  field: string;
  role: string;
  /** Ω or F (an NTC: its resistance at 25 °C / t0). */
  value: number;
  /** RKM code for resistors (4K7), engineering notation for capacitors (100 nF). */
  code: string;
  /** The coarsest IEC 60063 series holding the value; null when none does. */
  series: SeriesName | null;
  tolerance: number;
  warning: string | null;
}

export interface Bom {
  lines: BomLine[];
  warnings: string[];
}

/** The coarsest series (E6 … E192) whose values include `value` (to 3 significant figures). */
export function seriesOf(value: number): SeriesName | null {
  if (!(value > 0 && Number.isFinite(value))) return null;
  const decade = Math.floor(Math.log10(value));
  let mantissa = value / 10 ** decade;
  if (mantissa >= 9.995) mantissa /= 10;
  const m = Number(mantissa.toPrecision(3));
  if (Math.abs(mantissa - m) > 1e-9 * m) return null;
  for (const name of SERIES_NAMES) if (seriesValues(name).some((v) => Math.abs(v - m) < 1e-9)) return name;
  return null;
}

const STAGE_ROLES: Record<string, string> = {
  rInput: "input resistor (input to the summing pin)",
  rGround: "ground-leg resistor (inverting pin to the reference)",
  rReference: "reference resistor (reference to the non-inverting pin)",
  rFeedback: "feedback resistor (output to the summing pin)",
  rTiming: "timing resistor (output to the capacitor node)",
};

/** Bill of materials of a parsed scenario (or a scenario draft that parses). */
export function billOfMaterials(scenario: Scenario | ScenarioInput): Bom {
  const tol = { ...DEFAULT_TOLERANCES, ...(scenario.tolerances ?? {}) };
  const lines: BomLine[] = [];
  let r = 0;
  let c = 0;
  let th = 0;
  const add = (kind: BomLine["kind"], group: BomGroup, field: string, role: string, value: number | undefined) => {
    if (typeof value !== "number" || !(value > 0)) return;
    const series = seriesOf(value);
    const ref = kind === "resistor" ? `R${++r}` : kind === "capacitor" ? `C${++c}` : `TH${++th}`;
    // A non-standard value is shown with every digit it has, so it cannot pass for a standard one.
    const code = kind === "capacitor" ? formatQuantity(value, "F", series ? 3 : 6) : formatRkm(value, series ? 3 : 6);
    const unit = kind === "capacitor" ? "F" : "Ω";
    const warning =
      series === null
        ? `${ref} (${field}) ${formatQuantity(value, unit, 4)} is not a standard value in any E series (E6–E192): choose a standard value or build it from two parts`
        : null;
    lines.push({
      ref,
      kind,
      group,
      field,
      role,
      value,
      code,
      series,
      tolerance: kind === "capacitor" ? tol.capacitor : kind === "thermistor" ? tol.ntcR25 : tol.resistor,
      warning,
    });
  };

  const sensor = scenario.source?.sensor;
  if (sensor?.kind === "divider") {
    add("resistor", "source", "source.sensor.rTop", "source divider, source to the sensing node", sensor.rTop);
    add("resistor", "source", "source.sensor.rBottom", "source divider, sensing node to 0 V", sensor.rBottom);
  } else if (sensor?.kind === "ntc") {
    const m = sensor.model as Record<string, unknown>;
    const nominal = typeof m.r25 === "number" ? m.r25 : undefined;
    if (nominal !== undefined)
      add(
        "thermistor",
        "source",
        "source.sensor.model.r25",
        `NTC thermistor (${sensor.position} of the sensing divider)`,
        nominal,
      );
    else
      lines.push({
        ref: `TH${++th}`,
        kind: "thermistor",
        group: "source",
        field: "source.sensor.model",
        role: `NTC thermistor (${sensor.position} of the sensing divider), curve by coefficients`,
        value: NaN,
        code: "—",
        series: null,
        tolerance: tol.ntcR25,
        warning: null,
      });
    add(
      "resistor",
      "source",
      "source.sensor.rFixed",
      `fixed resistor (${sensor.position === "bottom" ? "top" : "bottom"} of the sensing divider)`,
      sensor.rFixed,
    );
  }
  if (scenario.filter) {
    add("resistor", "filter", "filter.r", "filter resistor (sensor output to the stage input)", scenario.filter.r);
    add("capacitor", "filter", "filter.c", "filter capacitor (stage input to 0 V)", scenario.filter.c);
  }
  const st = scenario.stage as Record<string, unknown> & { kind: string };
  const divider = st.referenceDivider as { rTop: number; rBottom: number } | undefined;
  for (const role of ["rInput", "rGround", "rReference", "rFeedback", "rTiming"]) {
    // With a reference divider, rReference is its Thevenin form, not a part of its own.
    if (role === "rReference" && divider) continue;
    add("resistor", "stage", `stage.${role}`, STAGE_ROLES[role], st[role] as number | undefined);
  }
  add(
    "capacitor",
    "stage",
    "stage.cTiming",
    "timing capacitor (capacitor node to 0 V)",
    st.cTiming as number | undefined,
  );
  if (divider) {
    add(
      "resistor",
      "reference",
      "stage.referenceDivider.rTop",
      "reference divider, top end to the reference node",
      divider.rTop,
    );
    add(
      "resistor",
      "reference",
      "stage.referenceDivider.rBottom",
      "reference divider, reference node to the bottom end",
      divider.rBottom,
    );
  }
  if (scenario.output?.kind === "open-drain")
    add(
      "resistor",
      "output",
      "output.pullUp",
      "pull-up resistor (output pin to the pull-up rail)",
      scenario.output.pullUp,
    );
  return { lines, warnings: lines.flatMap((l) => (l.warning ? [l.warning] : [])) };
}

/** The parts list as CSV: ref,kind,group,field,role,value,code,series,tolerance,warning. */
export function bomToCsv(bom: Bom): string {
  const q = (s: string) => (/[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
  const rows = ["ref,kind,group,field,role,value,code,series,tolerance,warning"];
  for (const l of bom.lines)
    rows.push(
      [
        l.ref,
        l.kind,
        l.group,
        l.field,
        q(l.role),
        String(l.value),
        q(l.code),
        l.series ?? "",
        String(l.tolerance),
        q(l.warning ?? ""),
      ].join(","),
    );
  return rows.join("\n") + "\n";
}
